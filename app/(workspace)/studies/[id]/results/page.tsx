import { ResultsPage } from '@/components/results/results-page';

export default function StudyResultsPage() {
  return <ResultsPage />;
}
