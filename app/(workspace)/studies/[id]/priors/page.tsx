import { PriorsPage } from '@/components/planner/priors-page';

export default function StudyPriorsPage() {
  return <PriorsPage />;
}
