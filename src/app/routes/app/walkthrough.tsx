import { ComingSoon } from '@/components/layouts/coming-soon';

export default function WalkthroughRoute() {
  return <ComingSoon title="Walkthrough" description="Step-by-step playback of a route or a plan." />;
}
