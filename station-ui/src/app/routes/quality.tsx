// chart styles only on this lazily loaded page, so the operator screen does not carry them
import '@mantine/charts/styles.css';
import { QualityScreen } from '@/features/yield/components/quality-screen';

export default function QualityRoute() {
  return <QualityScreen />;
}
