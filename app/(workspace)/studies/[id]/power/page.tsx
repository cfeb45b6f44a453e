import { PowerPage } from '@/components/power/power-page';

export default function StudyPowerPage() {
  return <PowerPage />;
}
