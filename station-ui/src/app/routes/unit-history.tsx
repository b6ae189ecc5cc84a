import { useParams } from 'react-router-dom';
import { UnitHistoryScreen } from '@/features/units/components/unit-history-screen';

export default function UnitHistoryRoute() {
  const { serial = '' } = useParams();
  // a new serial is a new page: no expanded rows carried over from the last one
  return <UnitHistoryScreen key={serial} serial={serial} />;
}
