/**
 * The restraint angle conventions of shared/compute/reach.ts drawn in an oblique view: the socket
 * plane, the normal n, the reference direction (station +x projected onto the plane), the yaw arc
 * about n from the reference to the target's direction in the plane, and the pitch arc from the
 * plane up to the direction from the work point c to the target.
 */
export function YawPitchDiagram() {
  // oblique projection of the restraint frame: ref → right-down, side → right-up, up → up
  const c = { x: 150, y: 70 };
  const p = { x: 150, y: 150 };
  const ref = { x: 245, y: 175 };
  const inPlane = { x: 225, y: 118 };
  const target = { x: 232, y: 42 };
  return (
    <figure className="space-y-2">
      <svg
        viewBox="0 0 320 222"
        role="img"
        aria-labelledby="yaw-pitch-title yaw-pitch-desc"
        className="w-full max-w-sm rounded-md border border-surface-line bg-surface-panel"
      >
        <title id="yaw-pitch-title">Restraint yaw and pitch</title>
        <desc id="yaw-pitch-desc">
          The socket plane with the socket p and its outward normal n. The work point c lies on n at the
          stand-off. The reference direction is the station +x axis projected onto the plane. Yaw turns about
          n from the reference to the target&apos;s direction in the plane, counter-clockwise seen from
          outside. Pitch rises from the plane to the direction from c to the target, positive away from the
          structure.
        </desc>
        <defs>
          <marker
            id="yp-arrow"
            viewBox="0 0 10 10"
            refX="9"
            refY="5"
            markerWidth="7"
            markerHeight="7"
            orient="auto-start-reverse"
          >
            <path d="M0,0 L10,5 L0,10 z" fill="currentColor" />
          </marker>
        </defs>
        <g className="text-text-strong" fill="none" stroke="currentColor" strokeWidth="1.5">
          <polygon
            points="40,165 190,205 290,140 140,110"
            className="fill-surface-sunken"
            strokeDasharray="4 3"
          />
          <line x1={p.x} y1={p.y} x2={c.x} y2={c.y - 35} markerEnd="url(#yp-arrow)" />
          <line
            x1={p.x}
            y1={p.y}
            x2={ref.x}
            y2={ref.y}
            markerEnd="url(#yp-arrow)"
            className="text-accent-strong"
          />
          <line x1={p.x} y1={p.y} x2={inPlane.x} y2={inPlane.y} strokeDasharray="3 3" />
          <line x1={c.x} y1={c.y} x2={inPlane.x} y2={inPlane.y - 78} strokeDasharray="3 3" />
          <line
            x1={c.x}
            y1={c.y}
            x2={target.x}
            y2={target.y}
            markerEnd="url(#yp-arrow)"
            className="text-danger"
          />
          <path
            d="M 190 161 A 42 20 0 0 0 186 139"
            markerEnd="url(#yp-arrow)"
            className="text-caution"
            strokeWidth="2"
          />
          <path
            d="M 198 70 A 48 48 0 0 0 194 56"
            markerEnd="url(#yp-arrow)"
            className="text-caution"
            strokeWidth="2"
          />
        </g>
        <g className="fill-text-strong text-[11px]" fontFamily="Inter, sans-serif">
          <circle cx={p.x} cy={p.y} r="3.5" />
          <circle cx={c.x} cy={c.y} r="3.5" />
          <circle cx={target.x} cy={target.y} r="4" className="fill-danger" />
          <text x={p.x - 60} y={p.y + 4}>
            socket p
          </text>
          <text x={c.x - 92} y={c.y + 4}>
            work point c
          </text>
          <text x={c.x + 6} y={c.y - 30}>
            n (normal)
          </text>
          <text x={150} y={218}>
            ref: station +x on the plane
          </text>
          <text x={target.x + 8} y={target.y + 4}>
            target
          </text>
          <text x={200} y={150} className="fill-caution font-semibold">
            yaw
          </text>
          <text x={204} y={64} className="fill-caution font-semibold">
            pitch
          </text>
          <text x={48} y={182}>
            socket plane
          </text>
        </g>
      </svg>
      <figcaption className="text-xs text-text-muted">
        Yaw: about the socket normal, from the station +x axis projected onto the socket plane, positive
        counter-clockwise seen from outside (−180° to 180°). Pitch: from the socket plane up to the line from
        the work point to the target, positive away from the structure (−90° to 90°). Set values are rounded
        to the restraint&apos;s steps.
      </figcaption>
    </figure>
  );
}
