import fc from 'fast-check';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { useState } from 'react';
import { act, screen, waitFor, within } from '@testing-library/react';
import userEvent, { type UserEvent } from '@testing-library/user-event';
import { staleVersionDetails } from '@shared/errors';
import { StationDocumentSchema } from '@shared/schemas/station';
import type { StationGraph } from '@shared/schemas/station-edits';
import { stationSummaryOf } from '../factories/station-graph';
import { EditPanel } from '@/features/station-editor/components/edit-panel';
import { changedFields } from '@/features/station-editor/components/node-form';
import { suggestNodeKey } from '@/features/station-editor/utils/node-keys';
import { buildStationDocument, FIXTURE_KEYS } from '../factories/station-document';
import { renderInDataRouter } from '../setup/client';

afterEach(() => vi.unstubAllGlobals());

function graphAt(version: number): StationGraph {
  const doc = StationDocumentSchema.parse(buildStationDocument());
  const pos = new Map(doc.nodes.map((n) => [n.key, n.position]));
  return {
    station: stationSummaryOf(doc, { id: 1, version, at: '2026-01-01T00:00:00.000Z' }),
    segments: doc.segments,
    nodes: doc.nodes,
    hazards: doc.hazards,
    arms: doc.arms,
    edges: doc.edges.map((e, i) => {
      const [a, b] = [pos.get(e.from)!, pos.get(e.to)!];
      return {
        id: i + 1,
        from: e.from,
        to: e.to,
        kind: e.kind,
        lengthM: e.lengthM ?? Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]),
        lengthGiven: e.lengthM !== undefined,
        closed: e.closed ?? false,
      };
    }),
  };
}

interface Sent {
  method: string;
  path: string;
  body: { version?: number; node?: Record<string, unknown> };
}

/** A stand-in for the station API's version check: a write against anything but the current version is refused. */
function fakeStationApi(current: { version: number; by: string }) {
  const sent: Sent[] = [];
  const fetch = vi.fn(async (url: string, init: RequestInit = {}) => {
    const path = new URL(url, 'http://test').pathname;
    const method = init.method ?? 'GET';
    if (method === 'GET') return Response.json({ items: [], total: 0, page: 1, pageSize: 30 });
    // the editor first asks which reviewed plans the change would touch: none here
    if (new URL(url, 'http://test').searchParams.get('dryRun') === '1')
      return Response.json({ dryRun: true, version: current.version, affectedPlans: [] });
    const body = JSON.parse(String(init.body ?? '{}'));
    sent.push({ method, path, body });
    if (body.version !== current.version) {
      return Response.json(
        {
          error: {
            code: 'CONFLICT',
            message: `This station was changed since you loaded it: you had version ${body.version}, it is now version ${current.version}, last changed by ${current.by} at 2026-01-01T10:00:00.000Z. Reload it and make your change again; nothing was saved.`,
            details: staleVersionDetails(body.version ?? 0, {
              currentVersion: current.version,
              changedBy: current.by,
              changedAt: '2026-01-01T10:00:00.000Z',
            }),
          },
        },
        { status: 409 },
      );
    }
    current.version += 1;
    return Response.json(
      { version: current.version, node: body.node },
      { status: method === 'POST' ? 201 : 200 },
    );
  });
  vi.stubGlobal('fetch', fetch);
  return sent;
}

/** The panel's form of that name, with its fields and buttons found by their labels. */
function form(name: string) {
  const f = screen.getByRole('form', { name });
  const scope = within(f);
  return {
    element: f,
    field: (label: string) => scope.getByLabelText<HTMLInputElement>(label),
    button: (label: string) => scope.getByRole('button', { name: label }),
  };
}

/** The edit panel on `graph`, with `selectedKey` selected (nothing else wired). */
function renderPanel(graph: StationGraph, selectedKey: string | null = null) {
  return renderInDataRouter(
    <EditPanel
      graph={graph}
      selectedKey={selectedKey}
      onSelectNode={vi.fn()}
      pick={null}
      onChanged={vi.fn()}
    />,
  );
}

/** Clears a field and types `text` into it, as a person replacing what is there. */
async function retype(user: UserEvent, input: HTMLElement, text: string) {
  await user.clear(input);
  await user.type(input, text);
}

describe('suggestNodeKey', () => {
  it('suggests a key that is free and one past the highest number on that prefix and kind', () => {
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.integer({ min: 1, max: 300 }), { maxLength: 40 }),
        fc.array(fc.string()),
        (numbers, others) => {
          const existing = [...numbers.map((n) => `PB3-A${String(n).padStart(2, '0')}`), ...others];
          const key = suggestNodeKey(existing, 'PB3', 'anchor');
          expect(existing).not.toContain(key);
          const match = /^PB3-A(\d{2,})$/.exec(key);
          expect(match).not.toBeNull();
          expect(Number(match![1])).toBeGreaterThan(Math.max(0, ...numbers));
        },
      ),
    );
  });

  it('keeps numbering per kind letter: PB3-A07 exists, the next anchor is PB3-A08 and the first socket PB3-S01', () => {
    const existing = ['PB3-A07', 'PB3-J02', 'SB1-A09'];
    expect(suggestNodeKey(existing, 'PB3', 'anchor')).toBe('PB3-A08');
    expect(suggestNodeKey(existing, 'PB3', 'socket')).toBe('PB3-S01');
  });
});

describe('EditPanel', () => {
  it('adds a socket typed by numbers, sending the loaded version and a unit normal', async () => {
    const sent = fakeStationApi({ version: 3, by: 'Erin Engineer' });
    const onChanged = vi.fn();
    const onSelectNode = vi.fn();
    renderInDataRouter(
      <EditPanel
        graph={graphAt(3)}
        selectedKey={null}
        onSelectNode={onSelectNode}
        pick={null}
        onChanged={onChanged}
      />,
    );
    const user = userEvent.setup();
    const add = form('Add node');
    await user.selectOptions(add.element.querySelector('select')!, 'socket');
    // the key followed the kind: the first socket on the first segment
    expect(add.field('Key').value).toBe('T1-S01');
    await retype(user, add.field('x (m)'), '4.25');
    await retype(user, add.field('y (m)'), '-1.5');
    await retype(user, add.field('z (m)'), '0');
    const normalInputs = [...add.element.querySelectorAll('fieldset')][1].querySelectorAll('input');
    await retype(user, normalInputs[1], '-2');
    await retype(user, normalInputs[2], '0');
    await user.click(add.button('Add node'));

    await screen.findByText(/Saved: add node T1-S01 \(version 4\)\./);
    expect(sent).toEqual([
      {
        method: 'POST',
        path: '/api/stations/1/nodes',
        body: {
          version: 3,
          node: { key: 'T1-S01', kind: 'socket', position: [4.25, -1.5, 0], normal: [0, -1, 0] },
        },
      },
    ]);
    expect(onChanged).toHaveBeenCalledTimes(1);
    expect(onSelectNode).toHaveBeenCalledWith('T1-S01');
  });

  it('moves the selected node by the nudge buttons', async () => {
    const sent = fakeStationApi({ version: 5, by: 'Erin Engineer' });
    renderPanel(graphAt(5), FIXTURE_KEYS.junction);
    const user = userEvent.setup();
    const change = form(`Change node ${FIXTURE_KEYS.junction}`);
    await user.click(change.button('x plus 0.1 m'));
    await user.click(change.button('x plus 0.1 m'));
    await user.click(change.button('z minus 0.1 m'));
    await user.click(change.button('Save node'));
    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0].method).toBe('PATCH');
    expect(sent[0].path).toBe(`/api/stations/1/nodes/${FIXTURE_KEYS.junction}`);
    expect(sent[0].body.version).toBe(5);
    // the fixture junction sits at (5, 0, 1.5)
    expect(sent[0].body.node?.position).toEqual([5.2, 0, 1.4]);
  });

  it('refuses a stale edit with who changed the station, then re-applies it against the new version', async () => {
    const server = { version: 8, by: 'Erin Engineer' };
    const sent = fakeStationApi(server);
    const onChanged = vi.fn();
    renderInDataRouter(
      <EditPanel
        graph={graphAt(7)}
        selectedKey={FIXTURE_KEYS.junction}
        onSelectNode={vi.fn()}
        pick={null}
        onChanged={onChanged}
      />,
    );
    const user = userEvent.setup();
    const change = form(`Change node ${FIXTURE_KEYS.junction}`);
    await retype(user, change.field('Label'), 'Stanchion 3');
    await user.click(change.button('Save node'));

    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toContain(
      'Someone else changed the station (now version 8, by Erin Engineer). Your change was not saved.',
    );
    expect(server.version).toBe(8);
    expect(onChanged).not.toHaveBeenCalled();

    await user.click(screen.getByRole('button', { name: 'Reload and re-apply my change' }));
    await screen.findByText(/Saved: change node T1-J01 \(version 9\)\./);
    expect(sent.map((s) => s.body.version)).toEqual([7, 8]);
    expect(sent[1].body.node).toEqual(sent[0].body.node);
    expect(sent[1].body.node?.label).toBe('Stanchion 3');
    expect(onChanged).toHaveBeenCalled();
  });
});

describe('EditPanel leaving', () => {
  it('asks before leaving while a form holds a change not saved, and not once it is saved', async () => {
    const server = { version: 7, by: 'Erin Engineer' };
    fakeStationApi(server);
    const { router } = renderPanel(graphAt(7), FIXTURE_KEYS.junction);
    const user = userEvent.setup();
    const change = form(`Change node ${FIXTURE_KEYS.junction}`);
    await retype(user, change.field('Label'), 'Stanchion 3');
    await act(() => router.navigate('/plans'));
    const leave = await screen.findByRole('dialog', { name: 'Leave without saving?' });
    expect(leave.textContent).toContain('A form holds edits to the model not saved yet');
    await user.click(within(leave).getByRole('button', { name: 'Stay on this page' }));
    expect(router.state.location.pathname).toBe('/');
    expect(change.field('Label').value).toBe('Stanchion 3');

    // typed back to what was loaded (the fixture's junction has no label): nothing is left to lose
    expect(graphAt(7).nodes.find((n) => n.key === FIXTURE_KEYS.junction)?.label ?? '').toBe('');
    await user.clear(change.field('Label'));
    await act(() => router.navigate('/plans'));
    expect(router.state.location.pathname).toBe('/plans');
  });
});

describe('EditPanel selecting another node', () => {
  /** The panel with the selection held as the station screen holds it; a button stands in for a click on the model. */
  function SelectionHarness({
    graph,
    onSelect,
  }: {
    graph: StationGraph;
    onSelect: (key: string | null) => void;
  }) {
    const [selected, setSelected] = useState<string | null>(FIXTURE_KEYS.junction);
    const select = (key: string | null) => {
      onSelect(key);
      setSelected(key);
    };
    return (
      <>
        <button type="button" onClick={() => select(FIXTURE_KEYS.anchorFar)}>
          Pick {FIXTURE_KEYS.anchorFar} on the model
        </button>
        <EditPanel
          graph={graph}
          selectedKey={selected}
          onSelectNode={select}
          pick={null}
          onChanged={vi.fn()}
        />
      </>
    );
  }

  it('asks before a typed change to the selected node is dropped; keeping it selects that node again', async () => {
    fakeStationApi({ version: 7, by: 'Erin Engineer' });
    const selections: (string | null)[] = [];
    renderInDataRouter(<SelectionHarness graph={graphAt(7)} onSelect={(k) => selections.push(k)} />);
    const user = userEvent.setup();
    const pickFar = screen.getByRole('button', { name: `Pick ${FIXTURE_KEYS.anchorFar} on the model` });
    await retype(user, form(`Change node ${FIXTURE_KEYS.junction}`).field('Label'), 'Stanchion 3');

    await user.click(pickFar);
    const ask = await screen.findByRole('dialog', {
      name: `Drop the edits to node ${FIXTURE_KEYS.junction}?`,
    });
    await user.click(within(ask).getByRole('button', { name: 'Keep editing' }));
    expect(screen.queryByRole('dialog')).toBeNull();
    // the node being edited is selected again, its form still holds what was typed
    expect(selections).toEqual([FIXTURE_KEYS.anchorFar, FIXTURE_KEYS.junction]);
    expect(form(`Change node ${FIXTURE_KEYS.junction}`).field('Label').value).toBe('Stanchion 3');

    await user.click(pickFar);
    await user.click(
      within(await screen.findByRole('dialog', { name: /^Drop the edits/ })).getByRole('button', {
        name: 'Drop the edits',
      }),
    );
    expect(form(`Change node ${FIXTURE_KEYS.anchorFar}`).field('Key').value).toBe(FIXTURE_KEYS.anchorFar);
    expect(screen.queryByRole('form', { name: `Change node ${FIXTURE_KEYS.junction}` })).toBeNull();
  });

  it('keeps a label typed in the node form when another form (the settings) saves a change', async () => {
    const sent = fakeStationApi({ version: 7, by: 'Erin Engineer' });
    renderInDataRouter(<SelectionHarness graph={graphAt(7)} onSelect={() => {}} />);
    const user = userEvent.setup();
    await retype(user, form(`Change node ${FIXTURE_KEYS.junction}`).field('Label'), 'Stanchion 3');
    const settings = form('Station settings');
    await retype(user, settings.field('Default tether length (m, or type ft)'), '20');
    await user.click(settings.button('Save settings'));
    await screen.findByText(/Saved: .*\(version 8\)/);
    expect(sent).toHaveLength(1);
    expect(form(`Change node ${FIXTURE_KEYS.junction}`).field('Label').value).toBe('Stanchion 3');
    // and it is saved against the version the settings made
    await user.click(form(`Change node ${FIXTURE_KEYS.junction}`).button('Save node'));
    await waitFor(() => expect(sent).toHaveLength(2));
    expect(sent[1].body).toMatchObject({ version: 8, node: { label: 'Stanchion 3' } });
  });

  it('shows the other node at once when nothing typed is left to lose', async () => {
    fakeStationApi({ version: 7, by: 'Erin Engineer' });
    renderInDataRouter(<SelectionHarness graph={graphAt(7)} onSelect={() => {}} />);
    const user = userEvent.setup();
    const label = form(`Change node ${FIXTURE_KEYS.junction}`).field('Label');
    // typed and typed back: the form holds what was loaded
    await user.type(label, 'x');
    await user.clear(label);
    await user.click(screen.getByRole('button', { name: `Pick ${FIXTURE_KEYS.anchorFar} on the model` }));
    expect(screen.queryByRole('dialog')).toBeNull();
    expect(form(`Change node ${FIXTURE_KEYS.anchorFar}`).field('Key').value).toBe(FIXTURE_KEYS.anchorFar);
  });
});

describe('changedFields', () => {
  it('sends only what differs from the loaded node, so a re-apply leaves others’ fields alone', () => {
    const node = {
      key: 'PB3-A07',
      kind: 'anchor' as const,
      label: 'Old',
      position: [1, 2, 3] as [number, number, number],
    };
    expect(changedFields(node, { kind: 'anchor', label: 'Old', notes: null, position: [1, 2, 3] })).toEqual(
      {},
    );
    expect(changedFields(node, { kind: 'anchor', label: 'New', notes: null, position: [1, 2, 3.1] })).toEqual(
      {
        label: 'New',
        position: [1, 2, 3.1],
      },
    );
  });
});

describe('EditPanel settings and hazards', () => {
  it('reads a tether typed in feet as metres (1 ft = 0.3048 m, NIST SP 811) and sends it with the version', async () => {
    const sent = fakeStationApi({ version: 2, by: 'Erin Engineer' });
    renderPanel(graphAt(2));
    const user = userEvent.setup();
    const settings = form('Station settings');
    await retype(user, settings.field('Default tether length (m, or type ft)'), '85 ft');
    await within(settings.element).findByText(/25\.91 m = 85\.0 ft/);
    await user.click(settings.button('Save settings'));
    await waitFor(() => expect(sent).toHaveLength(1));
    const body = sent[0].body as { version: number; settings: { tetherLengthM: number; speedsMps: object } };
    expect(sent[0]).toMatchObject({ method: 'PATCH', path: '/api/stations/1' });
    expect(body.version).toBe(2);
    expect(body.settings.tetherLengthM).toBeCloseTo(85 * 0.3048, 9);
    expect(body.settings.speedsMps).toEqual({ handrail: 0.1, hop: 0.1, ride: 0.05 });
  });

  it('refuses a box hazard whose max is not above its min, by the station schema, and sends nothing', async () => {
    const sent = fakeStationApi({ version: 2, by: 'Erin Engineer' });
    renderPanel(graphAt(2));
    const user = userEvent.setup();
    const hazard = form('Add hazard');
    await retype(user, hazard.field('Key'), 'PUMP-1');
    await user.selectOptions([...hazard.element.querySelectorAll('select')][1], 'box');
    const maxX = [...hazard.element.querySelectorAll('fieldset')][1].querySelector('input')!;
    await retype(user, maxX, '-5');
    await user.click(hazard.button('Add hazard'));
    await within(hazard.element).findByText(/box max must be greater than min on every axis/);
    expect(sent).toEqual([]);
  });
});

describe('EditPanel arms', () => {
  const withArm = (version: number): StationGraph => ({
    ...graphAt(version),
    arms: [
      { key: 'ARM-A', baseNode: FIXTURE_KEYS.junction, reachM: 12, tipSpeedMps: 0.05, settleSeconds: 60 },
    ],
  });

  it('adds an arm on the selected node: the whole list goes out with the loaded version', async () => {
    const sent = fakeStationApi({ version: 4, by: 'Erin Engineer' });
    renderPanel(withArm(4), FIXTURE_KEYS.anchorFar);
    const user = userEvent.setup();
    const arm = form('Add arm');
    expect(arm.field('Base node').value).toBe(FIXTURE_KEYS.anchorFar);
    await retype(user, arm.field('Arm key'), 'ARM-B');
    await retype(user, arm.field('Reach (m)'), '9.5');
    await user.clear(arm.field('Minimum reach (m)'));
    await user.click(arm.button('Add arm'));
    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0]).toMatchObject({ method: 'PATCH', path: '/api/stations/1' });
    expect(sent[0].body).toEqual({
      version: 4,
      arms: [
        withArm(4).arms[0],
        { key: 'ARM-B', baseNode: FIXTURE_KEYS.anchorFar, reachM: 9.5, tipSpeedMps: 0.05, settleSeconds: 60 },
      ],
    });
    await screen.findByText(/Saved: add arm ARM-B/);
  });

  it('refuses an unknown base, a key a node has, and a minimum reach not below the reach; sends nothing', async () => {
    const sent = fakeStationApi({ version: 4, by: 'Erin Engineer' });
    renderPanel(withArm(4));
    const user = userEvent.setup();
    const arm = form('Add arm');
    await retype(user, arm.field('Arm key'), FIXTURE_KEYS.airlock);
    await retype(user, arm.field('Base node'), 'NO-SUCH-NODE');
    await user.click(arm.button('Add arm'));
    await within(arm.element).findByText(/already a node key/);
    within(arm.element).getByText(/unknown node key "NO-SUCH-NODE"/);
    await retype(user, arm.field('Arm key'), 'ARM-A');
    await retype(user, arm.field('Base node'), FIXTURE_KEYS.junction);
    await retype(user, arm.field('Minimum reach (m)'), '20');
    await user.click(arm.button('Add arm'));
    await within(arm.element).findByText(/minimum reach must be below the reach/);
    within(arm.element).getByText(/duplicate arm key "ARM-A"/);
    expect(sent).toEqual([]);
  });

  it('changes an arm in place and removes one', async () => {
    const sent = fakeStationApi({ version: 4, by: 'Erin Engineer' });
    renderPanel(withArm(4));
    const user = userEvent.setup();
    await user.click(screen.getByRole('button', { name: 'Change arm ARM-A' }));
    const arm = form('Change arm ARM-A');
    await retype(user, arm.field('Tip speed (m/s)'), '0.08');
    await user.click(arm.button('Save arm'));
    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0].body).toEqual({ version: 4, arms: [{ ...withArm(4).arms[0], tipSpeedMps: 0.08 }] });
    await user.click(screen.getByRole('button', { name: 'Remove arm ARM-A' }));
    await waitFor(() => expect(sent).toHaveLength(2));
    // the fake answered version 5 to the first change: the next carries it
    expect(sent[1].body).toEqual({ version: 5, arms: [] });
  });
});
