import { z } from 'zod';
import { endpoint } from './endpoint';

export const oneLineQuerySchema = z.object({
  scenario: z
    .string()
    .min(1)
    .max(120)
    .optional()
    .describe('Operating scenario whose out-of-service elements are drawn dashed (default: the model as written)'),
  collapsed: z
    .union([z.string().max(64), z.array(z.string().max(64)).max(5000)])
    .optional()
    .transform((v) => (v === undefined ? undefined : (Array.isArray(v) ? v : [v]).filter((id) => id !== '')))
    .describe(
      'Bus ids (repeat the parameter for each) whose subtrees are drawn as one summary box each; given, exactly these are collapsed. Without it a model of more than 150 buses opens with the subtrees below the second level collapsed.',
    ),
  expanded: z
    .literal('all')
    .optional()
    .describe('"all": nothing collapsed, whatever the model’s size (when no `collapsed` is given)'),
});

const tone = z.enum(['ink', 'muted', 'accent', 'danger', 'caution', 'problem', 'surface']);
const box = z.object({ x: z.number(), y: z.number(), w: z.number(), h: z.number() });
const shape = z.discriminatedUnion('t', [
  z.object({ t: z.literal('line'), pts: z.array(z.number()), tone, width: z.number(), dashed: z.boolean().optional() }),
  box.extend({
    t: z.literal('rect'),
    tone,
    fill: tone.optional(),
    dashed: z.boolean().optional(),
    halo: z.boolean().optional(),
  }),
  z.object({
    t: z.literal('circle'),
    cx: z.number(),
    cy: z.number(),
    r: z.number(),
    tone,
    fill: tone.optional(),
    dashed: z.boolean().optional(),
  }),
  z.object({
    t: z.literal('text'),
    x: z.number(),
    y: z.number(),
    text: z.string(),
    size: z.number(),
    anchor: z.enum(['start', 'middle', 'end']),
    tone,
    bold: z.boolean().optional(),
  }),
]);

/** The drawing as geometry (shared/oneLine/geometry.ts): what the app renders, the same as the SVG. */
export const oneLineDrawingSchema = z
  .object({
    title: z.string(),
    /** The model's operating scenarios (none: only the model as written), and the one whose dashes are drawn. */
    scenarios: z.array(z.object({ id: z.string(), name: z.string() })),
    scenarioId: z.string().nullable(),
    width: z.number(),
    height: z.number(),
    elements: z.array(
      z.object({
        id: z.string(),
        kind: z.enum(['bus', 'utility', 'generator', 'motor', 'transformer', 'cable', 'tie', 'device', 'summary']),
        box,
        busId: z.string().optional(),
        deviceKind: z.enum(['relay', 'fuse', 'thermal-magnetic', 'electronic', 'band']).optional(),
        dashed: z.boolean().optional(),
        problem: z.boolean().optional(),
        subtree: z.object({ buses: z.number(), collapsed: z.boolean(), toggle: box }).optional(),
        summary: z
          .object({
            of: z.string(),
            buses: z.number(),
            hidden: z.array(z.string()),
            worst: z
              .object({
                busId: z.string(),
                incidentEnergyCalPerCm2: z.number(),
                signalWord: z.enum(['DANGER', 'WARNING']).nullable(),
              })
              .optional(),
          })
          .optional(),
        shapes: z.array(shape),
      }),
    ),
    connections: z.array(
      z.object({ a: z.string(), b: z.string(), pts: z.array(z.number()), dashed: z.boolean().optional() }),
    ),
    /** The buses drawn collapsed (each with one summary element). */
    collapsed: z.array(z.string()),
    notes: z.array(z.string()),
  })
  .meta({ id: 'OneLineDrawing' });

/** The one-line diagram of a study revision, drawn from its model (shared/oneLine). */
export const oneLineApi = {
  svg: endpoint({
    method: 'get',
    path: '/studies/:studyId/one-line.svg',
    summary:
      'The one-line diagram of the revision’s model as a standalone SVG: every element with its id, and at each labelled bus the incident energy, signal word and governing scenario of the study’s results (the approved run, else the latest finished run); buses with model problems marked.',
    tag: 'studies',
    access: ['engineer', 'safety', 'admin'],
    query: oneLineQuerySchema,
    produces: 'image/svg+xml',
  }),
  drawing: endpoint({
    method: 'get',
    path: '/studies/:studyId/one-line',
    summary:
      'The same one-line diagram as geometry (boxes, lines, circles, texts with coordinates), for the app to draw.',
    tag: 'studies',
    access: ['engineer', 'safety', 'admin'],
    query: oneLineQuerySchema,
    response: oneLineDrawingSchema,
  }),
};
