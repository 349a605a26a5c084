/**
 * The cover page: organization, title, site, the key figures of the study, the approval or the preliminary notice,
 * and the cautions.
 */
import { STUDY_STATUS_LABELS } from '../../../shared/schemas/studies';
import type { BusResult } from '../../../shared/schemas/studyResults';
import { UNREVIEWED_CAUTION } from '../../../shared/cautions';
import { BLACK } from '../canvas';
import { formatCalPerCm2, formatSig } from '../format';
import { PRELIMINARY_BANNER } from './approval';
import { isApproved, type StudyReportInput } from './input';
import { formatTimestamp } from './texts';
import { CONTENT_W, MARGIN_X, type ReportWriter } from './writer';

export function renderCover(w: ReportWriter, input: StudyReportInput): void {
  const { study, results, site } = input;
  const { fonts } = w;
  const approved = isApproved(study);
  const capS = results.maxArcDurationMs / 1000;
  const okBuses = results.buses.filter((b) => b.status === 'ok');
  w.newPage();
  w.cv.text(input.organizationName, MARGIN_X, w.y, CONTENT_W, {
    font: fonts.textBold,
    size: 11,
    minSize: 8,
    maxLines: 2,
  });
  w.y += 40;
  w.cv.text('ARC-FLASH STUDY REPORT', MARGIN_X, w.y, CONTENT_W, { font: fonts.textBold, size: 11 });
  w.y += 18;
  w.y +=
    w.cv.text(study.title, MARGIN_X, w.y, CONTENT_W, { font: fonts.textBold, size: 24, minSize: 14, maxLines: 3 })
      .height + 8;
  w.y += w.cv.text(site.name, MARGIN_X, w.y, CONTENT_W, {
    font: fonts.text,
    size: 14,
    minSize: 10,
    maxLines: 2,
  }).height;
  w.y +=
    w.cv.text(site.address, MARGIN_X, w.y, CONTENT_W, { font: fonts.text, size: 10, minSize: 8, maxLines: 3 }).height +
    20;
  const maxBus = okBuses.reduce<BusResult | null>(
    (m, b) => ((b.incidentEnergyCalPerCm2 ?? -1) > (m?.incidentEnergyCalPerCm2 ?? -1) ? b : m),
    null,
  );
  const dangerCount = okBuses.filter((b) => b.labelValues?.signalWord === 'DANGER').length;
  w.keyValues([
    ['Revision', String(study.revision)],
    ['Status', STUDY_STATUS_LABELS[study.status]],
    ['Model version', String(study.modelVersion)],
    ['Results computed', study.latestRun?.finishedAt ? formatTimestamp(study.latestRun.finishedAt) : '—'],
    [
      'Buses studied',
      `${okBuses.length}${results.buses.length > okBuses.length ? ` (${results.buses.length - okBuses.length} with errors)` : ''}`,
    ],
    [
      'Highest incident energy',
      maxBus
        ? `${formatCalPerCm2(maxBus.incidentEnergyCalPerCm2 ?? NaN)} cal/cm² at ${maxBus.busId} (${maxBus.busName})`
        : '—',
    ],
    ['DANGER labels', `${dangerCount} of ${okBuses.length}`],
    ['Arc duration cap', `${formatSig(capS, 3)} s`],
  ]);
  w.y += 16;
  if (approved && study.approval) {
    const a = study.approval;
    const top = w.y;
    w.y += 10;
    w.cv.text('APPROVAL', MARGIN_X + 12, w.y, CONTENT_W - 24, { font: fonts.textBold, size: 10 });
    w.y += 16;
    const pairs: [string, string][] = [
      ['Approved by', a.approverName],
      ['Licence number', a.licenceNumber],
      ['Jurisdiction', a.jurisdiction],
      ['Approved on', a.approvedAt.slice(0, 10)],
      ['Review by', a.reviewDueAt.slice(0, 10)],
    ];
    for (const [k, v] of pairs) {
      w.cv.text(k, MARGIN_X + 12, w.y, 130, { font: fonts.textBold, size: 10 });
      w.y +=
        w.cv.text(v, MARGIN_X + 150, w.y, CONTENT_W - 162, { font: fonts.text, size: 10, minSize: 7, maxLines: 2 })
          .height + 3;
    }
    w.y += 8;
    w.cv.rect(MARGIN_X, top, CONTENT_W, w.y - top, { stroke: BLACK, lineWidth: 1.2 });
    w.y += 12;
  } else {
    const top = w.y;
    const h = 78;
    w.cv.rect(MARGIN_X, top, CONTENT_W, h, { stroke: BLACK, lineWidth: 3 });
    w.cv.text(PRELIMINARY_BANNER, MARGIN_X + 10, top + 12, CONTENT_W - 20, {
      font: fonts.textBold,
      size: 28,
      minSize: 14,
      align: 'center',
    });
    w.cv.text(UNREVIEWED_CAUTION, MARGIN_X + 10, top + 50, CONTENT_W - 20, {
      font: fonts.text,
      size: 9.5,
      minSize: 7,
      maxLines: 2,
      align: 'center',
    });
    w.y += h + 12;
  }
  w.cv.text('Cautions', MARGIN_X, w.y, CONTENT_W, { font: fonts.textBold, size: 9.5 });
  w.y += 14;
  w.bullets([...input.cautions], 8.5);
}
