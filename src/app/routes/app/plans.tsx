import { ComingSoon } from '@/components/layouts/coming-soon';

export default function PlansRoute() {
  return <ComingSoon title="Plans" description="EVA plans by status: draft, in review and approved." />;
}
