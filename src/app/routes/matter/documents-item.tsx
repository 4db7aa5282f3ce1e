import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, type LoaderFunctionArgs, useNavigate, useParams } from 'react-router-dom';
import { Button, ErrorPanel, Notice, PageHeader, SkeletonRows } from '@/components/ui';
import { documentQueryOptions, useDocument } from '@/features/documents/api/get-document';
import { DeleteDocumentDialog } from '@/features/documents/components/delete-document-dialog';
import { DocumentView } from '@/features/documents/components/document-view';
import { isApiError } from '@/lib/api-client';
import { useMatterPermission } from '@/lib/authorization';
import { parseMatterId, useMatterId } from './layout';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    const docId = parseMatterId(params.docId);
    if (Number.isNaN(matterId) || Number.isNaN(docId)) return null;
    void queryClient.prefetchQuery(documentQueryOptions(matterId, docId));
    return null;
  };

/** One document: metadata, family and extracted text. */
export function DocumentRoute() {
  const matterId = useMatterId();
  const docId = parseMatterId(useParams().docId);
  const allowed = useMatterPermission('documents.read');
  if (!allowed) {
    return (
      <Notice tone="warn" title="Not available to your role">
        Your role does not include reading this matter's documents.
      </Notice>
    );
  }
  if (Number.isNaN(docId)) return <DocumentMissing matterId={matterId} />;
  return <DocumentPage matterId={matterId} docId={docId} />;
}

function DocumentMissing({ matterId }: { matterId: number }) {
  return (
    <Notice tone="warn" title="No such document">
      This matter has no document at that address.{' '}
      <Link className="underline" to={`/matters/${matterId}/documents`}>
        Back to the documents
      </Link>
    </Notice>
  );
}

function DocumentPage({ matterId, docId }: { matterId: number; docId: number }) {
  const document = useDocument(matterId, docId);
  const canDelete = useMatterPermission('documents.delete');
  const [deleting, setDeleting] = useState(false);
  const navigate = useNavigate();
  const back = (
    <Link
      to={`/matters/${matterId}/documents`}
      className="text-accent-strong underline-offset-2 hover:underline"
    >
      ← Documents
    </Link>
  );
  if (document.isPending) return <SkeletonRows rows={10} label="Opening the document" />;
  if (document.isError) {
    if (isApiError(document.error) && document.error.status === 404)
      return <DocumentMissing matterId={matterId} />;
    return (
      <ErrorPanel
        error={document.error}
        title="The document could not be opened"
        onRetry={() => void document.refetch()}
      />
    );
  }
  const detail = document.data.document;
  return (
    <div data-testid="document-page">
      <PageHeader
        eyebrow={
          <span className="flex gap-3">
            {back}
            <span className="font-mono">{detail.controlNumber}</span>
          </span>
        }
        title={detail.title || detail.name}
        actions={
          canDelete ? (
            <Button
              variant="danger"
              onClick={() => setDeleting(true)}
              data-testid="delete-document"
            >
              Delete…
            </Button>
          ) : undefined
        }
      />
      <DocumentView matterId={matterId} data={document.data} />
      <DeleteDocumentDialog
        matterId={matterId}
        document={deleting ? detail : null}
        onClose={() => setDeleting(false)}
        onDeleted={() => void navigate(`/matters/${matterId}/documents`)}
      />
    </div>
  );
}
