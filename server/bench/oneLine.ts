/**
 * One-line diagram layout (shared/oneLine): a 2 000-bus radial plant and a 2 000-bus looped mesh, laid out and written
 * as SVG. Prints the figures; asserts nothing.
 */
import { parseModel, type ModelInput } from '../../shared/schemas/model';
import { layoutOneLine } from '../../shared/oneLine/layout';
import { oneLineSvg } from '../../shared/oneLine/svg';
import { loopedMesh, radialPlant } from './scaling';

export async function benchOneLine(): Promise<{ name: string; opsPerSecond: number; detail: string }> {
  const lines: string[] = [];
  let total = 0;
  for (const [name, input] of [
    ['radial plant, 2 000 buses', radialPlant(2000)],
    ['looped mesh, 2 000 buses', loopedMesh(2000)],
  ] as [string, ModelInput][]) {
    const p = parseModel(input);
    if (!p.success) throw new Error(name);
    const t0 = performance.now();
    const d = layoutOneLine(p.model);
    const t1 = performance.now();
    const svg = oneLineSvg(d);
    const t2 = performance.now();
    total += (t1 - t0) / 1000;
    lines.push(
      `${name}: layout ${((t1 - t0) / 1000).toFixed(2)} s, SVG ${((t2 - t1) / 1000).toFixed(2)} s ` +
        `(${d.elements.length} elements, ${d.width} × ${d.height} px, ${(svg.length / 1e6).toFixed(1)} MB)`,
    );
  }
  return { name: 'One-line layout (2 000 buses)', opsPerSecond: 2 / total, detail: lines.join('\n') };
}
