import { contract } from '../../shared/api';
import { bind } from '../http/route';
import { studyOneLineSvg } from '../services/oneLine';

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
];
