import { ComingSoon } from '@/components/layouts/coming-soon';

export default function StationSocketsRoute() {
  return (
    <ComingSoon
      title="Socket planner"
      description="The fewest foot-restraint sockets that bring every task within reach."
    />
  );
}
