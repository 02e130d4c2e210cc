import { ComingSoon } from '@/components/layouts/coming-soon';

export default function StationRoute() {
  return (
    <ComingSoon
      title="Station"
      description="The 3D model, its layers and the tables of nodes, edges and hazards."
    />
  );
}
