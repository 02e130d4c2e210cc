import { ComingSoon } from '@/components/layouts/coming-soon';

export default function PlanRoute() {
  return <ComingSoon title="Plan" description="Crew, tasks, manifest, timeline and review of one EVA." />;
}
