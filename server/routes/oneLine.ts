import { contract } from '../../shared/api';
import { bind } from '../http/route';
import { studyOneLine, studyOneLineSvg } from '../services/oneLine';

/** The one-line diagram of a study revision as SVG (shared/api/oneLine.ts). */
export const oneLineRoutes = [
  bind(contract.oneLine.svg, {
    handler: async ({ user, params, query, res }) => {
      const svg = await studyOneLineSvg(user, params.studyId, query.scenario);
      res.setHeader('Content-Type', 'image/svg+xml; charset=utf-8');
      res.setHeader('Cache-Control', 'private, no-cache');
      res.send(svg);
    },
  }),
  bind(contract.oneLine.drawing, {
    handler: async ({ user, params, query }) => {
      const { drawing, ...rest } = await studyOneLine(user, params.studyId, query.scenario);
      return { ...rest, ...drawing };
    },
  }),
];
