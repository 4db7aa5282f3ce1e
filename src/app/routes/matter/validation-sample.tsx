import { useParams } from 'react-router-dom';
import { Notice } from '@/components/ui';
import { SampleReport } from '@/features/validation/components/sample-report';
import { useMatterPermission } from '@/lib/authorization';
import { useMatterId } from './layout';

export function ValidationSampleRoute() {
  const matterId = useMatterId();
  const sampleId = Number(useParams().sampleId);
  const allowed = useMatterPermission('validation.view');
  if (!allowed)
    return (
      <Notice tone="warn" title="Not available to your role">
        The matter lead and attorneys see recall validation.
      </Notice>
    );
  if (!Number.isInteger(sampleId) || sampleId < 1)
    return <Notice tone="warn" title="No such sample" />;
  return <SampleReport matterId={matterId} sampleId={sampleId} />;
}
