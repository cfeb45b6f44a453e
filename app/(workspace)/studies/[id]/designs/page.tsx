import { DesignList } from '@/components/planner/design-list';

export default function StudyDesignsPage() {
  return <DesignList />;
}
