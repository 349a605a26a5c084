import { contract } from '../../shared/api';
import { bind } from '../http/route';
import { studyOneLine, studyOneLineSvg, type CollapseRequest } from '../services/oneLine';

/** `collapsed` ids given: exactly those; else `expanded=all`: none; else the default for the model's size. */
const collapseOf = (q: { collapsed?: string[]; expanded?: 'all' }): CollapseRequest =>
  q.collapsed?.length ? q.collapsed : q.expanded === 'all' ? 'none' : undefined;

/** The one-line diagram of a study revision as SVG (shared/api/oneLine.ts). */
export const oneLineRoutes = [
  bind(contract.oneLine.svg, {
    handler: async ({ user, params, query, res }) => {
      const svg = await studyOneLineSvg(user, params.studyId, query.scenario, collapseOf(query));
      res.setHeader('Content-Type', 'image/svg+xml; charset=utf-8');
      res.setHeader('Cache-Control', 'private, no-cache');
      res.send(svg);
    },
  }),
  bind(contract.oneLine.drawing, {
    handler: async ({ user, params, query }) => {
      const { drawing, ...rest } = await studyOneLine(user, params.studyId, query.scenario, collapseOf(query));
      return { ...rest, ...drawing };
    },
  }),
];
