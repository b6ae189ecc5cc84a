// chart styles only on this lazily loaded page, so the operator screen does not carry them
import '@mantine/charts/styles.css';
import { CharacterizationScreen } from '@/features/characterization/components/characterization-screen';

export default function CharacterizationRoute() {
  return <CharacterizationScreen />;
}
