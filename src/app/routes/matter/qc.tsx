import { QcPage } from '@/features/qc/components/qc-page';
import { useMatterId } from './layout';

/** /matters/:matterId/qc (?sample=: one sample's calls) */
export function QcRoute() {
  return <QcPage matterId={useMatterId()} />;
}
