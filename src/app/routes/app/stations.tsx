import { ComingSoon } from '@/components/layouts/coming-soon';

export default function StationsRoute() {
  return (
    <ComingSoon
      title="Stations"
      description="Station exterior models: handrails, anchors, sockets, worksites and hazards."
    />
  );
}
