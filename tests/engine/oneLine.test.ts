/**
 * The one-line diagram's geometry (shared/oneLine): checked for what a drawing must be, on the demo models and on
 * generated plants. The properties are the issue's acceptance rules (no published source: drawing rules of the
 * product): every element drawn once, no two bus or device boxes overlap, every line's ends touch the boxes of the
 * elements it joins, the SVG is well-formed XML holding every element id.
 */
import { DOMParser } from '@xmldom/xmldom';
import { modelSchema, parseModel, validateModel, type Model, type ModelInput } from '../../shared/schemas/model';
import { busTree, defaultCollapsed, layoutOneLine } from '../../shared/oneLine/layout';
import { hazardsFromResults } from '../../shared/oneLine/hazards';
import { formatCalPerCm2 } from '../../shared/labelDisplay';
import { runStudy } from '../../server/engine/study/scenarios';
import { generatedPlant } from '../../server/seed/generatedPlant';
import type { StudyResults } from '../../shared/schemas/studyResults';
import { boxesOverlap, textBox, touchesBox, type Box, type OneLineDrawing } from '../../shared/oneLine/geometry';
import { oneLineSvg } from '../../shared/oneLine/svg';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { solidsBuildingModel } from '../../server/seed/solidsBuildingModel';
import { loopedMesh, radialPlant } from '../../server/bench/scaling';

const parsed = (input: ModelInput): Model => {
  const p = parseModel(input);
  if (!p.success) throw new Error(JSON.stringify(p.issues.slice(0, 3)));
  return p.model;
};

const allIds = (m: Model) => [
  ...m.buses.map((x) => x.id),
  ...m.sources.map((x) => x.id),
  ...m.transformers.map((x) => x.id),
  ...m.cables.map((x) => x.id),
  ...m.ties.map((x) => x.id),
  ...m.motors.map((x) => x.id),
  ...m.devices.map((x) => x.id),
];

/**
 * Pairs of labels whose boxes overlap: every text of the drawing (ids, names, hazards, summary lines, symbol letters)
 * and the place kept for each bus's collapse toggle (drawn by the app). Readability rule of the product (no source).
 */
function labelOverlaps(d: OneLineDrawing): string[] {
  const labels: { what: string; b: Box }[] = [];
  for (const e of d.elements) {
    for (const s of e.shapes) if (s.t === 'text') labels.push({ what: `${e.id}:${s.text}`, b: textBox(s) });
    if (e.subtree) labels.push({ what: `${e.id}:toggle`, b: e.subtree.toggle });
  }
  labels.sort((a, b) => a.b.x - b.b.x);
  const out: string[] = [];
  for (let i = 0; i < labels.length; i++)
    for (let j = i + 1; j < labels.length && labels[j].b.x < labels[i].b.x + labels[i].b.w; j++)
      if (boxesOverlap(labels[i].b, labels[j].b)) out.push(`${labels[i].what} / ${labels[j].what}`);
  return out;
}

/** Lines between elements that pass through a label's box (each label also has its halo; this keeps them clear). */
function edgeLabelCrossings(d: OneLineDrawing): string[] {
  const labels: { what: string; b: Box }[] = [];
  for (const e of d.elements)
    for (const s of e.shapes)
      if (s.t === 'text' && s.size >= 10) labels.push({ what: `${e.id}:${s.text}`, b: textBox(s) });
  // The app's collapse toggles too.
  for (const e of d.elements) if (e.subtree) labels.push({ what: `${e.id}:toggle`, b: e.subtree.toggle });
  const out: string[] = [];
  for (const c of d.connections)
    for (let k = 0; k + 3 < c.pts.length; k += 2) {
      const [x1, y1, x2, y2] = c.pts.slice(k, k + 4);
      const seg = {
        x: Math.min(x1, x2),
        y: Math.min(y1, y2),
        w: Math.abs(x2 - x1) || 0.01,
        h: Math.abs(y2 - y1) || 0.01,
      };
      for (const l of labels) if (boxesOverlap(seg, l.b)) out.push(`${c.a}-${c.b} × ${l.what}`);
    }
  return out;
}

/** Texts not drawn on a halo: the shape before each must be a surface-filled rect covering the text's box. */
function unhaloed(d: OneLineDrawing): string[] {
  const out: string[] = [];
  for (const e of d.elements)
    e.shapes.forEach((s, i) => {
      if (s.t !== 'text') return;
      const h = e.shapes[i - 1];
      const b = textBox(s);
      const covers =
        h?.t === 'rect' &&
        h.halo &&
        h.fill === 'surface' &&
        h.x <= b.x &&
        h.y <= b.y &&
        h.x + h.w >= b.x + b.w &&
        h.y + h.h >= b.y + b.h;
      if (!covers) out.push(`${e.id}:${s.text}`);
    });
  return out;
}

function checkDrawing(m: Model, d: OneLineDrawing): void {
  // Every element drawn exactly once.
  const counts = new Map<string, number>();
  for (const e of d.elements) counts.set(e.id, (counts.get(e.id) ?? 0) + 1);
  for (const id of allIds(m)) expect([id, counts.get(id)]).toEqual([id, 1]);
  expect(d.elements).toHaveLength(allIds(m).length);

  // No two bus or device boxes overlap (sweep over x).
  const boxes = d.elements.filter((e) => e.kind === 'bus' || e.kind === 'device').sort((a, b) => a.box.x - b.box.x);
  const overlaps: string[] = [];
  for (let i = 0; i < boxes.length; i++) {
    for (let j = i + 1; j < boxes.length && boxes[j].box.x < boxes[i].box.x + boxes[i].box.w; j++) {
      if (boxesOverlap(boxes[i].box, boxes[j].box)) overlaps.push(`${boxes[i].id}/${boxes[j].id}`);
    }
  }
  expect(overlaps).toEqual([]);

  // Every line's ends touch the boxes of the two elements it joins; every box within the drawing.
  const byId = new Map(d.elements.map((e) => [e.id, e]));
  const loose: string[] = [];
  for (const c of d.connections) {
    const a = byId.get(c.a);
    const b = byId.get(c.b);
    const n = c.pts.length;
    if (!a || !b) loose.push(`${c.a}-${c.b} unknown`);
    else if (!touchesBox(c.pts[0], c.pts[1], a.box) || !touchesBox(c.pts[n - 2], c.pts[n - 1], b.box))
      loose.push(`${c.a}-${c.b}`);
  }
  expect(loose).toEqual([]);
  expect(labelOverlaps(d)).toEqual([]);
  expect(unhaloed(d)).toEqual([]);
  expect(edgeLabelCrossings(d)).toEqual([]);
  for (const e of d.elements) {
    expect(e.box.x).toBeGreaterThanOrEqual(0);
    expect(e.box.y + e.box.h).toBeLessThanOrEqual(d.height);
    expect(e.box.x + e.box.w).toBeLessThanOrEqual(d.width);
  }

  // Every branch, source and motor is joined to what it connects (bus-to-bus paths exist through lines).
  const joined = new Set(d.connections.flatMap((c) => [c.a, c.b]));
  for (const id of [...m.transformers, ...m.cables, ...m.ties, ...m.sources, ...m.motors].map((x) => x.id)) {
    expect([id, joined.has(id)]).toEqual([id, true]);
  }
}

function checkSvg(m: Model, d: OneLineDrawing, everyId = true): void {
  const svg = oneLineSvg(d, { title: `${m.name} <one-line> & "ids"` });
  // Strict parse: any well-formedness error (or warning) is collected and must be none.
  const errors: string[] = [];
  const doc = new DOMParser({
    errorHandler: (level: string, msg: unknown) => {
      errors.push(`${level}: ${msg}`);
    },
  }).parseFromString(svg, 'image/svg+xml');
  expect(errors).toEqual([]);
  expect(doc.documentElement?.nodeName).toBe('svg');
  expect(doc.getElementsByTagName('g').length).toBeGreaterThanOrEqual(d.elements.length);
  // Every label sits on a halo in the background colour (a rect drawn just before it, covering its box): a line
  // passing behind a label does not run through its letters.
  const texts = Array.from(doc.getElementsByTagName('text')).filter((x) => x.parentNode?.nodeName === 'g');
  expect(texts.length).toBeGreaterThan(0);
  const bare = texts.filter((x) => {
    let prev = x.previousSibling;
    while (prev && prev.nodeType !== 1) prev = prev.previousSibling;
    const r = prev as Element | null;
    return (
      r?.nodeName !== 'rect' ||
      r.getAttribute('class') !== 'halo' ||
      r.getAttribute('fill') !== '#FFFFFF' ||
      Number(r.getAttribute('x')) > Number(x.getAttribute('x'))
    );
  });
  expect(bare.map((x) => x.textContent)).toEqual([]);
  if (!everyId) return;
  for (const id of allIds(m)) {
    expect([id, svg.includes(`data-id="${id}"`) && svg.includes(`>${id}</text>`)]).toEqual([id, true]);
  }
}

describe('one-line diagram geometry', () => {
  test.each([
    ['Larkspur Valley facility', larkspurModel()],
    ['Solids Handling Building (scenarios)', solidsBuildingModel()],
    ['radial plant, 300 buses', radialPlant(300)],
    ['looped mesh, 300 buses', loopedMesh(300)],
  ])('%s: every element once, no overlaps, lines end on their elements, valid SVG', (_name, input) => {
    const m = parsed(input);
    const d = layoutOneLine(m);
    checkDrawing(m, d);
    checkSvg(m, d);
  });

  test('sources at the top, power flowing down: each transformer below its primary bus and above its secondary', () => {
    const m = parsed(larkspurModel());
    const d = layoutOneLine(m);
    const y = new Map(d.elements.map((e) => [e.id, e.box.y]));
    for (const t of m.transformers) {
      expect(y.get(t.id)!).toBeGreaterThan(y.get(t.fromBus)!);
      expect(y.get(t.id)!).toBeLessThan(y.get(t.toBus)!);
    }
    for (const s of m.sources) expect(y.get(s.id)!).toBeLessThan(y.get(s.bus)!);
    for (const mo of m.motors) expect(y.get(mo.id)!).toBeGreaterThan(y.get(mo.bus)!);
  });

  test('hazard text at a bus: energy (formatted), signal word and the governing scenario; problems marked', () => {
    const m = parsed(solidsBuildingModel());
    const bus = m.buses[1].id;
    const d = layoutOneLine(m, {
      hazards: new Map([[bus, { incidentEnergyCalPerCm2: 8.04, signalWord: 'WARNING', scenario: 'Tie closed' }]]),
      problems: new Set([m.buses[0].id]),
    });
    const texts = (id: string) =>
      d.elements.find((e) => e.id === id)!.shapes.flatMap((s) => (s.t === 'text' ? [s.text] : []));
    // Rounded up, never down: 8.04 shows as 8.1 (shared/labelDisplay.ts formatCalPerCm2, one decimal, ceiling).
    expect(texts(bus)).toContain('8.1 cal/cm² · WARNING');
    expect(texts(bus)).toContain('governed by: Tie closed');
    expect(texts(m.buses[0].id)).toContain('! model problem');
  });

  test('an open tie and, in a scenario, what it takes out of service are dashed', () => {
    const m = parsed(solidsBuildingModel());
    const base = layoutOneLine(m);
    for (const t of m.ties) {
      expect(base.elements.find((e) => e.id === t.id)!.dashed ?? false).toBe(!t.closed);
    }
    for (const sc of m.scenarios ?? []) {
      const d = layoutOneLine(m, { scenarioId: sc.id });
      for (const [id, o] of Object.entries(sc.sources ?? {})) {
        if (o.inService === false) expect(d.elements.find((e) => e.id === id)!.dashed).toBe(true);
      }
      for (const [id, o] of Object.entries(sc.ties ?? {})) {
        expect(d.elements.find((e) => e.id === id)!.dashed ?? false).toBe(!o.closed);
      }
    }
  });

  test('a model with problems (unknown bus, self-loop, island, device on no branch) is still drawn whole, problems marked', () => {
    const base = larkspurModel();
    const input: ModelInput = {
      ...base,
      buses: [...(base.buses ?? []), { id: 'LONE', name: 'Island bus', nominalKv: 0.48 }],
      cables: [
        ...(base.cables ?? []),
        {
          id: 'C-BAD',
          fromBus: 'SWBD-1',
          toBus: 'NOWHERE',
          lengthM: 10,
          sets: 1,
          size: '4/0',
          material: 'Cu',
          conduit: 'steel',
        },
        {
          id: 'C-SELF',
          fromBus: 'SWBD-1',
          toBus: 'SWBD-1',
          lengthM: 10,
          sets: 1,
          size: '4/0',
          material: 'Cu',
          conduit: 'steel',
        },
      ],
      devices: [
        ...(base.devices ?? []),
        { ...base.devices![0], id: 'CB-ORPHAN', source: undefined, branch: 'NO-SUCH', end: 'from' },
      ],
    };
    const m = modelSchema.parse(input);
    const issues = validateModel(m);
    expect(issues.length).toBeGreaterThan(0);
    const problems = new Set(issues.flatMap((i) => [...(i.elementId ? [i.elementId] : []), ...(i.elementIds ?? [])]));
    const d = layoutOneLine(m, { problems });
    checkDrawing(m, d);
    checkSvg(m, d);
    for (const id of ['C-BAD', 'C-SELF', 'CB-ORPHAN', 'LONE']) expect([id, problems.has(id)]).toEqual([id, true]);
    for (const id of problems) {
      const e = d.elements.find((x) => x.id === id);
      if (e) expect([id, e.problem]).toEqual([id, true]);
    }
  });
});

/** The incident energy a bus's label carries (else the bus's own), read straight from a run's results. */
const labelEnergy = (results: StudyResults, busId: string): number | undefined => {
  const b = results.buses.find((x) => x.busId === busId);
  if (!b || b.status !== 'ok') return undefined;
  return b.labelValues?.incidentEnergyCalPerCm2 ?? b.incidentEnergyCalPerCm2;
};

/**
 * A collapsed drawing: every element of the model is either drawn exactly once or stands inside exactly one summary
 * (never both); one summary per collapsed bus, hanging from that bus; no bus, device or summary boxes overlap; lines
 * end on their elements; each summary's highest energy is the maximum over its hidden buses in the run's results.
 */
function checkCollapsed(m: Model, d: OneLineDrawing, results?: StudyResults): void {
  const drawn = new Map<string, number>();
  const inside = new Map<string, number>();
  for (const e of d.elements) {
    if (e.kind === 'summary') for (const id of e.summary!.hidden) inside.set(id, (inside.get(id) ?? 0) + 1);
    else drawn.set(e.id, (drawn.get(e.id) ?? 0) + 1);
  }
  for (const id of allIds(m)) {
    expect([id, (drawn.get(id) ?? 0) + (inside.get(id) ?? 0)]).toEqual([id, 1]);
  }
  const summaries = d.elements.filter((e) => e.kind === 'summary');
  expect(summaries.map((e) => e.summary!.of).sort()).toEqual([...d.collapsed].sort());
  for (const s of summaries) {
    expect(drawn.get(s.summary!.of)).toBe(1);
    expect(d.connections.some((c) => c.a === s.summary!.of && c.b === s.id)).toBe(true);
    expect(s.summary!.buses).toBe(s.summary!.hidden.filter((id) => m.buses.some((b) => b.id === id)).length);
  }

  const boxes = d.elements.filter((e) => e.kind === 'bus' || e.kind === 'device' || e.kind === 'summary');
  const overlaps: string[] = [];
  for (let i = 0; i < boxes.length; i++)
    for (let j = i + 1; j < boxes.length; j++)
      if (boxesOverlap(boxes[i].box, boxes[j].box)) overlaps.push(`${boxes[i].id}/${boxes[j].id}`);
  expect(overlaps).toEqual([]);
  const byId = new Map(d.elements.map((e) => [e.id, e]));
  const loose = d.connections.filter((c) => {
    const a = byId.get(c.a);
    const b = byId.get(c.b);
    const n = c.pts.length;
    return !a || !b || !touchesBox(c.pts[0], c.pts[1], a.box) || !touchesBox(c.pts[n - 2], c.pts[n - 1], b.box);
  });
  expect(loose.map((c) => `${c.a}-${c.b}`)).toEqual([]);
  expect(labelOverlaps(d)).toEqual([]);
  expect(edgeLabelCrossings(d)).toEqual([]);
  expect(unhaloed(d)).toEqual([]);

  if (!results) return;
  for (const s of summaries) {
    const hiddenBuses = s.summary!.hidden.filter((id) => m.buses.some((b) => b.id === id));
    const energies = hiddenBuses.map((id) => labelEnergy(results, id)).filter((e): e is number => e !== undefined);
    expect(energies.length).toBeGreaterThan(0);
    const max = Math.max(...energies);
    expect(s.summary!.worst?.incidentEnergyCalPerCm2).toBe(max);
    expect(labelEnergy(results, s.summary!.worst!.busId)).toBe(max);
    // Written in the box, with its signal word and its bus (text, not colour alone).
    const texts = s.shapes.flatMap((x) => (x.t === 'text' ? [x.text] : []));
    const word = results.buses.find((b) => b.busId === s.summary!.worst!.busId)!.labelValues?.signalWord;
    expect(texts).toContain(
      `Highest: ${formatCalPerCm2(max)} cal/cm² · ${word ?? 'no signal word'} at ${s.summary!.worst!.busId}`,
    );
    // A DANGER inside is never hidden: named either as the highest or on its own line.
    const dangerInside = hiddenBuses.filter(
      (id) => results.buses.find((b) => b.busId === id)?.labelValues?.signalWord === 'DANGER',
    );
    if (dangerInside.length) expect(texts.some((t) => t.includes('DANGER'))).toBe(true);
  }
}

test('the label check finds two labels drawn over each other (and not two apart)', () => {
  const text = (x: number, y: number) =>
    ({ t: 'text', x, y, text: 'SWBD-1', size: 11, anchor: 'start', tone: 'ink' }) as const;
  const drawing = (y2: number): OneLineDrawing => ({
    width: 200,
    height: 200,
    elements: [
      { id: 'A', kind: 'bus', box: { x: 0, y: 0, w: 10, h: 5 }, shapes: [text(20, 20)] },
      { id: 'B', kind: 'bus', box: { x: 0, y: 100, w: 10, h: 5 }, shapes: [text(30, y2)] },
    ],
    connections: [],
    collapsed: [],
    notes: [],
  });
  expect(labelOverlaps(drawing(24))).toHaveLength(1);
  expect(labelOverlaps(drawing(40))).toEqual([]);
});

describe('one-line diagram: collapsed subtrees', () => {
  test('generated plant (184 buses): opens with each substation’s feeders collapsed; summaries hold exactly the buses downstream, with the highest energy of the run', () => {
    const m = parsed(generatedPlant(3, 60));
    expect(m.buses.length).toBe(184);
    const results = runStudy(m);
    const hazards = hazardsFromResults(results);
    const collapsed = defaultCollapsed(m);
    // The second level: the three substations (each feeds 60 MCC buses); the service bus HV stays open.
    expect(collapsed.sort()).toEqual(['SUB-0', 'SUB-1', 'SUB-2']);
    const d = layoutOneLine(m, { hazards, collapsed });
    expect(d.collapsed.sort()).toEqual(collapsed);
    checkCollapsed(m, d, results);
    // Downstream of a substation, found independently: the buses no source reaches once it is removed (radial plant).
    for (const s of d.elements.filter((e) => e.kind === 'summary')) {
      const cut = s.summary!.of;
      const reach = new Set(['HV']);
      let grew = true;
      while (grew) {
        grew = false;
        for (const br of [...m.transformers, ...m.cables]) {
          for (const [a, b] of [
            [br.fromBus, br.toBus],
            [br.toBus, br.fromBus],
          ]) {
            if (reach.has(a) && !reach.has(b) && b !== cut) {
              reach.add(b);
              grew = true;
            }
          }
        }
      }
      const downstream = m.buses.map((b) => b.id).filter((id) => id !== cut && !reach.has(id));
      expect(s.summary!.hidden.filter((id) => m.buses.some((b) => b.id === id)).sort()).toEqual(downstream.sort());
    }
    checkSvg(m, { ...d, elements: d.elements.filter((e) => e.kind !== 'summary') } as OneLineDrawing, false);
  });

  test('the demo facility: each bus that feeds further collapsed alone, then all at once (the outermost wins)', () => {
    const m = parsed(larkspurModel());
    const results = runStudy(m);
    const hazards = hazardsFromResults(results);
    expect(defaultCollapsed(m)).toEqual([]);
    const { parent } = busTree(m);
    const feeding = [...new Set(parent.values())];
    expect(feeding.length).toBeGreaterThan(2);
    for (const bus of feeding) {
      const d = layoutOneLine(m, { hazards, collapsed: [bus] });
      expect(d.collapsed).toEqual([bus]);
      checkCollapsed(m, d, results);
      // The bus keeps its toggle, marked collapsed.
      expect(d.elements.find((e) => e.id === bus)!.subtree?.collapsed).toBe(true);
    }
    const all = layoutOneLine(m, { hazards, collapsed: feeding });
    checkCollapsed(m, all, results);
    expect(all.collapsed.length).toBeLessThan(feeding.length);
    // Expanded: every bus that feeds further has a toggle (not collapsed), and there is no summary.
    const open = layoutOneLine(m, { hazards });
    for (const bus of feeding) expect(open.elements.find((e) => e.id === bus)!.subtree?.collapsed).toBe(false);
    expect(open.elements.some((e) => e.kind === 'summary')).toBe(false);
  });

  test('a looped mesh (300 buses, links across subtrees): collapsed by default, every element drawn or inside one summary', () => {
    const m = parsed(loopedMesh(300));
    const collapsed = defaultCollapsed(m);
    expect(collapsed.length).toBeGreaterThan(0);
    const d = layoutOneLine(m, { collapsed });
    checkCollapsed(m, d);
    // Collapsing a bus already inside a collapsed subtree adds nothing.
    const { parent } = busTree(m);
    const nested = [...parent.entries()].find(([c, p]) => collapsed.includes(p) && [...parent.values()].includes(c));
    if (nested) {
      const d2 = layoutOneLine(m, { collapsed: [...collapsed, nested[0]] });
      expect(d2.collapsed.sort()).toEqual([...collapsed].sort());
      checkCollapsed(m, d2);
    }
  });

  test('a summary with no results says so; a problem inside is marked on it', () => {
    const m = parsed(larkspurModel());
    const { parent } = busTree(m);
    const child = [...parent.keys()].find((b) => parent.get(b) === 'SWBD-1' || parent.get(b) === 'USS-1')!;
    const owner = parent.get(child)!;
    const d = layoutOneLine(m, { collapsed: [owner], problems: new Set([child]) });
    const s = d.elements.find((e) => e.kind === 'summary')!;
    const texts = s.shapes.flatMap((x) => (x.t === 'text' ? [x.text] : []));
    expect(texts).toContain('No results for these buses');
    expect(texts.some((t) => t.startsWith(`! model problem at ${child}`))).toBe(true);
    expect(s.problem).toBe(true);
  });
});
