import { useEffect, useRef, useState } from 'react';
import { Notice, Spinner } from '@/components/ui';
import { plural } from '../format';

/** Pages rendered at most at once; the reader asks for more (large PDFs stay responsive). */
const PAGE_STEP = 10;

/**
 * The PDF's pages as the file draws them (pdfjs-dist 5, its worker bundled by Vite), at
 * the column's width. Scripts in the file never run (isEvalSupported: false).
 */
export function PdfPages({ url }: { url: string }) {
  const holder = useRef<HTMLDivElement>(null);
  const [state, setState] = useState<{ pages: number; error: string | null; loading: boolean }>({
    pages: 0,
    error: null,
    loading: true,
  });
  const [shown, setShown] = useState(PAGE_STEP);

  useEffect(() => {
    let cancelled = false;
    let destroy: (() => void) | null = null;
    (async () => {
      try {
        const pdfjs = await import('pdfjs-dist');
        const worker = await import('pdfjs-dist/build/pdf.worker.min.mjs?url');
        pdfjs.GlobalWorkerOptions.workerSrc = worker.default;
        const task = pdfjs.getDocument({ url, withCredentials: true, isEvalSupported: false });
        destroy = () => void task.destroy();
        const doc = await task.promise;
        if (cancelled) return;
        setState({ pages: doc.numPages, error: null, loading: false });
        const box = holder.current;
        if (!box) return;
        box.replaceChildren();
        const width = Math.max(320, box.clientWidth - 2);
        for (let n = 1; n <= Math.min(doc.numPages, shown); n++) {
          const page = await doc.getPage(n);
          if (cancelled) return;
          const base = page.getViewport({ scale: 1 });
          const scale = width / base.width;
          const viewport = page.getViewport({ scale: scale * (window.devicePixelRatio || 1) });
          const canvas = document.createElement('canvas');
          canvas.width = Math.floor(viewport.width);
          canvas.height = Math.floor(viewport.height);
          canvas.style.width = `${Math.floor(base.width * scale)}px`;
          canvas.className = 'mb-3 block border border-line bg-white shadow-sm';
          canvas.setAttribute('aria-label', `Page ${n} of ${doc.numPages}`);
          canvas.dataset.testid = 'pdf-page';
          box.append(canvas);
          await page.render({ canvas, viewport }).promise;
        }
      } catch (error) {
        if (!cancelled)
          setState({
            pages: 0,
            loading: false,
            error: error instanceof Error ? error.message : 'The PDF could not be drawn.',
          });
      }
    })();
    return () => {
      cancelled = true;
      destroy?.();
    };
  }, [url, shown]);

  return (
    <div data-testid="pdf-view">
      {state.loading ? <Spinner label="Drawing the pages" /> : null}
      {state.error ? (
        <Notice tone="warn" title="The pages could not be drawn">
          {state.error} The extracted text is one switch away.
        </Notice>
      ) : null}
      {state.pages > 0 ? (
        <p className="mb-2 text-xs text-ink-muted" data-testid="pdf-page-count">
          {plural(state.pages, 'page')}
          {state.pages > shown ? `, first ${shown} shown` : ''}
        </p>
      ) : null}
      <div ref={holder} />
      {state.pages > shown ? (
        <button
          type="button"
          className="text-sm text-accent-strong underline"
          onClick={() => setShown((s) => s + PAGE_STEP)}
        >
          Show {Math.min(PAGE_STEP, state.pages - shown)} more
        </button>
      ) : null}
    </div>
  );
}
