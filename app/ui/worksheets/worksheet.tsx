import { useState } from 'react';
import { api } from '../common/bridge.js';
import { useClinicSettings } from '../common/settings-context.js';
import { useChannel } from '../common/use-channel.js';
import { href } from '../shell/areas.js';
import { Sheet } from './sheet.js';
import { ScrollRegion } from '../common/scroll-region.js';

/** Asks the desktop to save the shown worksheet as a PDF; returns the line to show. */
async function savePdf(suggestedName: string): Promise<string> {
  const answer = await api.invoke('worksheets:save-pdf', { suggestedName });
  if (!answer.ok) return `Not saved: ${answer.error.message}`;
  return answer.value.saved ? `Saved ${answer.value.file}` : 'Not saved.';
}

/** `#/worksheets/<planId>`: the printable worksheet with Print and, in the desktop, Save as PDF. */
export function Worksheet({ planId }: { readonly planId: number }) {
  const [detail] = useChannel('plans:get', { id: planId });
  const [drugs] = useChannel('drugs:list', {});
  const [info] = useChannel('app:info', {});
  const [calibration] = useChannel('evidence:calibration', {});
  const settings = useClinicSettings();
  const [printedAt] = useState(() => new Date());
  const [pdfMessage, setPdfMessage] = useState<string | null>(null);

  const failed = [detail, drugs, info].find((load) => load.state === 'failed');
  if (failed !== undefined && failed.state === 'failed') {
    return (
      <section className="screen">
        <h1>Worksheet</h1>
        <p className="form-error" role="alert">
          {failed.error.message}
        </p>
        <p>
          <a href={href('worksheets')}>Back to the list of worksheets</a>
        </p>
      </section>
    );
  }
  if (
    detail.state !== 'ready' ||
    drugs.state !== 'ready' ||
    info.state !== 'ready' ||
    calibration.state === 'loading'
  )
    return <p aria-busy="true">Loading the worksheet…</p>;

  const name = (detail.value.patient?.values.name ?? detail.value.plan.input.patientName ?? 'plan').replace(
    /[^A-Za-z0-9-]+/g,
    '-',
  );
  return (
    <div className="worksheet-screen">
      <div className="ws-toolbar no-print">
        <a href={href('worksheets')}>All worksheets</a>
        <button type="button" className="primary" onClick={() => window.print()}>
          Print
        </button>
        {info.value.host === 'desktop' ? (
          <button
            type="button"
            onClick={() => {
              setPdfMessage('Saving…');
              void savePdf(`tidewing-worksheet-${planId}-${name}.pdf`).then(setPdfMessage);
            }}
          >
            Save as PDF
          </button>
        ) : (
          <span className="ws-small">
            For a PDF, press Print and choose Save as PDF as the printer, or run{' '}
            <code>npx tidewing worksheet</code>.
          </span>
        )}
        <span className="ws-small">
          Paper: {settings.paperSize === 'Letter' ? 'US Letter' : 'A4'} (change in Settings)
        </span>
        {pdfMessage !== null && <span role="status">{pdfMessage}</span>}
      </div>
      {/* The sheet keeps its paper width; a narrow window scrolls the preview, not the page. */}
      <ScrollRegion label="Worksheet preview">
        <Sheet
          detail={detail.value}
          drugs={drugs.value}
          appVersion={info.value.appVersion}
          settings={settings}
          printedAt={printedAt}
          calibration={calibration.state === 'ready' ? calibration.value : null}
        />
      </ScrollRegion>
    </div>
  );
}
