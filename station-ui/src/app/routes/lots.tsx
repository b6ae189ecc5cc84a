import { LotsScreen } from '@/features/lots/components/lots-screen';

/** Lots: creation by form and CSV, units, release with the certificate of conformance (src/features/lots/). */
export default function LotsRoute() {
  return <LotsScreen />;
}
