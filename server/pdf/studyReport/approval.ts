/** Sections 6 and 7: the cautions, and the approval block or the preliminary notice. */
import type { StudyDto } from '../../../shared/schemas/studies';
import { UNREVIEWED_CAUTION } from '../../../shared/cautions';
import { BLACK } from '../canvas';
import { isApproved } from './input';
import { CONTENT_W, MARGIN_X, type ReportWriter } from './writer';

export const PRELIMINARY_BANNER = 'PRELIMINARY — NOT APPROVED';

export function renderCautionsAndApproval(w: ReportWriter, study: StudyDto, cautions: readonly string[]): void {
  const { fonts } = w;
  const approved = isApproved(study);
  w.heading('6. Cautions');
  w.bullets([...cautions]);
  w.ensure(150); // keep the approval block on one page
  w.heading('7. Approval');
  if (approved && study.approval) {
    const a = study.approval;
    w.keyValues([
      ['Approved by', a.approverName],
      ['Licence number', a.licenceNumber],
      ['Jurisdiction', a.jurisdiction],
      ['Approved on', a.approvedAt.slice(0, 10)],
      ['Review by', a.reviewDueAt.slice(0, 10)],
    ]);
    if (study.status === 'superseded')
      w.paragraph('This revision has been superseded by a later revision of the study.', { font: fonts.textBold });
  } else {
    w.ensure(60);
    const top = w.y;
    w.cv.rect(MARGIN_X, top, CONTENT_W, 52, { stroke: BLACK, lineWidth: 2 });
    w.cv.text(PRELIMINARY_BANNER, MARGIN_X + 8, top + 8, CONTENT_W - 16, {
      font: fonts.textBold,
      size: 16,
      align: 'center',
    });
    w.cv.text(UNREVIEWED_CAUTION, MARGIN_X + 8, top + 30, CONTENT_W - 16, {
      font: fonts.text,
      size: 8.5,
      maxLines: 2,
      align: 'center',
    });
    w.y += 60;
  }
}
