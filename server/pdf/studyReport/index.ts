/**
 * The engineer's study report (docs/ARCHITECTURE.md, Data path of a study run, step 13): cover, scope, method and
 * assumptions, inputs, results, a clearing trace per bus with a time-current plot drawn as vectors, warnings, cautions
 * and the approval block (or the preliminary notice). US letter pages, page numbers and a footer on every page; tables
 * continue on the next page with their header repeated. Layout is a convention (common practice, no source).
 *
 * writer.ts lays out pages; one file per section draws it, in the order below.
 */
import { PDFDocument } from 'pdf-lib';
import { embedFonts } from '../fonts';
import { PRELIMINARY_BANNER, renderCautionsAndApproval } from './approval';
import { renderChanges } from './changes';
import { renderCover } from './cover';
import { isApproved, type StudyReportInput } from './input';
import { renderInputs } from './inputs';
import { renderMethod } from './method';
import { renderMitigationAppendix } from './mitigation';
import { renderOneLine } from './oneLine';
import { renderResults } from './results';
import { renderScenarios } from './scenarios';
import { renderScope } from './scope';
import { renderTraces } from './traces';
import { ReportWriter } from './writer';

export type { StudyReportInput } from './input';
export type { Column } from './writer';
export { PRELIMINARY_BANNER } from './approval';
export { METHOD_HEADING } from './method';
export { deviceLocation, deviceSettings } from './inputs';
export { tracePlotData } from './traces';
export {
  APPENDIX_OPTIONS_PER_BUS,
  MITIGATION_APPENDIX_HEADING,
  selectivityText,
  type MitigationAppendix,
  type MitigationAppendixBus,
} from './mitigation';

/** Renders the study report (see the module comment). */
export async function renderStudyReport(input: StudyReportInput): Promise<Uint8Array> {
  const { study, results, model, site } = input;
  const doc = await PDFDocument.create();
  doc.setTitle(`Arc-flash study report — ${study.title}, revision ${study.revision}`);
  doc.setSubject(`${site.name}`);
  doc.setCreator('Emberline');
  doc.setProducer('Emberline');
  const fonts = await embedFonts(doc);
  const w = new ReportWriter(doc, fonts);
  const approved = isApproved(study);

  renderCover(w, input);
  renderScope(w, input);
  renderMethod(w, results, model);
  renderInputs(w, results, model);
  renderOneLine(w, results, model);
  renderResults(w, results);
  renderScenarios(w, results, model);
  renderChanges(w, input.comparison);
  renderTraces(w, results, model);
  renderCautionsAndApproval(w, study, input.cautions);
  renderMitigationAppendix(w, input.mitigation, study);

  w.footers(
    `Emberline · ${input.organizationName} · ${site.name} · ${study.title}, revision ${study.revision}`,
    approved ? null : PRELIMINARY_BANNER,
  );
  return doc.save();
}
