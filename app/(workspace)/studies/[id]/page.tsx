import { StudyOverview } from '@/components/studies/study-overview';

export default function StudyOverviewPage() {
  return <StudyOverview />;
}
