// Terrain friction lookup. The map is compiled once into flat tables so that the per-foot,
// per-step lookup allocates nothing: the patches whose bounding box touches the foot's cell of a
// uniform grid (built here, over the patches' joint bounding box) are tested from last to first
// (later patches win), then the raster is indexed directly (O(1)), then the default. The grid
// makes the cost of a lookup depend on how many patches overlap there, not on how many exist.

import type { FrictionMap, Material } from './types.js';

const KIND_RECT = 0;
const KIND_CIRCLE = 1;
const KIND_POLYGON = 2;

/** Material table in structure-of-arrays form: index 0 is the default material. */
export class MaterialTable {
  readonly staticFriction: Float64Array;
  readonly kineticFriction: Float64Array;
  readonly stribeckVelocity_mps: Float64Array;
  readonly stribeckExponent: Float64Array;
  readonly viscous_Ns_per_m: Float64Array;
  readonly names: string[];

  constructor(materials: Material[]) {
    const n = materials.length;
    this.staticFriction = new Float64Array(n);
    this.kineticFriction = new Float64Array(n);
    this.stribeckVelocity_mps = new Float64Array(n);
    this.stribeckExponent = new Float64Array(n);
    this.viscous_Ns_per_m = new Float64Array(n);
    this.names = materials.map((m) => m.name);
    materials.forEach((m, i) => {
      this.staticFriction[i] = m.staticFriction;
      this.kineticFriction[i] = m.kineticFriction;
      this.stribeckVelocity_mps[i] = m.stribeckVelocity_mps;
      this.stribeckExponent[i] = m.stribeckExponent;
      this.viscous_Ns_per_m[i] = m.viscous_Ns_per_m;
    });
  }
}

export class FrictionField {
  readonly materials: MaterialTable;
  private readonly patchCount: number;
  private readonly patchKind: Uint8Array;
  /** Bounding boxes: minX, minY, maxX, maxY per patch. */
  private readonly patchBox: Float64Array;
  /** Circle: cx, cy, r² per patch (unused for other kinds). */
  private readonly patchCircle: Float64Array;
  /** Polygon vertices of all patches, flattened x0, y0, x1, y1 …; offset and count per patch. */
  private readonly polygonXY: Float64Array;
  private readonly polygonOffset: Int32Array;
  private readonly polygonCount: Int32Array;
  private readonly hasRaster: boolean;
  private readonly rasterOriginX: number;
  private readonly rasterOriginY: number;
  private readonly rasterInvCell: number;
  private readonly rasterNx: number;
  private readonly rasterNy: number;
  /** Material index of cell (i, j) at [i·ny + j]. */
  private readonly rasterMaterial: Int32Array;
  private readonly grid: PatchGrid;
  /** lookup()'s point, handed to lookupAt. */
  private readonly point = new Float64Array(2);

  constructor(map: FrictionMap) {
    const materials: Material[] = [map.default];
    const patches = map.patches;
    this.patchCount = patches.length;
    this.patchKind = new Uint8Array(patches.length);
    this.patchBox = new Float64Array(4 * patches.length);
    this.patchCircle = new Float64Array(3 * patches.length);
    this.polygonOffset = new Int32Array(patches.length);
    this.polygonCount = new Int32Array(patches.length);
    const polygonXY: number[] = [];
    patches.forEach((patch, p) => {
      materials.push(patch.material);
      const shape = patch.shape;
      const box = this.patchBox;
      if (shape.kind === 'rect') {
        this.patchKind[p] = KIND_RECT;
        box[4 * p] = Math.min(shape.min_m[0], shape.max_m[0]);
        box[4 * p + 1] = Math.min(shape.min_m[1], shape.max_m[1]);
        box[4 * p + 2] = Math.max(shape.min_m[0], shape.max_m[0]);
        box[4 * p + 3] = Math.max(shape.min_m[1], shape.max_m[1]);
      } else if (shape.kind === 'circle') {
        this.patchKind[p] = KIND_CIRCLE;
        const [cx, cy] = shape.center_m;
        const r = shape.radius_m;
        box[4 * p] = cx - r;
        box[4 * p + 1] = cy - r;
        box[4 * p + 2] = cx + r;
        box[4 * p + 3] = cy + r;
        this.patchCircle[3 * p] = cx;
        this.patchCircle[3 * p + 1] = cy;
        this.patchCircle[3 * p + 2] = r * r;
      } else {
        this.patchKind[p] = KIND_POLYGON;
        this.polygonOffset[p] = polygonXY.length;
        this.polygonCount[p] = shape.vertices_m.length;
        let minX = Infinity;
        let minY = Infinity;
        let maxX = -Infinity;
        let maxY = -Infinity;
        for (const [x, y] of shape.vertices_m) {
          polygonXY.push(x, y);
          minX = Math.min(minX, x);
          minY = Math.min(minY, y);
          maxX = Math.max(maxX, x);
          maxY = Math.max(maxY, y);
        }
        box[4 * p] = minX;
        box[4 * p + 1] = minY;
        box[4 * p + 2] = maxX;
        box[4 * p + 3] = maxY;
      }
    });
    this.polygonXY = new Float64Array(polygonXY);
    this.grid = buildPatchGrid(this.patchBox, patches.length);

    const raster = map.raster;
    if (raster) {
      this.hasRaster = true;
      this.rasterOriginX = raster.origin_m[0];
      this.rasterOriginY = raster.origin_m[1];
      this.rasterInvCell = 1 / raster.cell_m;
      this.rasterNx = raster.staticFriction.length;
      this.rasterNy = this.rasterNx > 0 ? raster.staticFriction[0].length : 0;
      this.rasterMaterial = new Int32Array(this.rasterNx * this.rasterNy);
      // Cells with equal friction share one material entry, so a large uniform raster stays small.
      const byKey = new Map<string, number>();
      for (let i = 0; i < this.rasterNx; i++) {
        for (let j = 0; j < this.rasterNy; j++) {
          const mus = raster.staticFriction[i][j];
          const muk = raster.kineticFriction[i][j];
          const key = `${mus}/${muk}`;
          let index = byKey.get(key);
          if (index === undefined) {
            index = materials.length;
            materials.push({
              ...map.default,
              name: `raster μs ${mus}`,
              staticFriction: mus,
              kineticFriction: muk,
            });
            byKey.set(key, index);
          }
          this.rasterMaterial[i * this.rasterNy + j] = index;
        }
      }
    } else {
      this.hasRaster = false;
      this.rasterOriginX = 0;
      this.rasterOriginY = 0;
      this.rasterInvCell = 0;
      this.rasterNx = 0;
      this.rasterNy = 0;
      this.rasterMaterial = new Int32Array(0);
    }
    this.materials = new MaterialTable(materials);
  }

  /** Index into `materials` of the ground at (x, y) on the ground plane. Allocation-free. */
  lookup(x: number, y: number): number {
    this.point[0] = x;
    this.point[1] = y;
    return this.lookupAt(this.point, 0);
  }

  /**
   * lookup(xy[offset], xy[offset + 1]): the per-step form, reading a foot's position where it lies
   * (plant.footPosition_m, offset 3i), so no double crosses a call the JIT may not inline (a boxed
   * heap number per call).
   */
  lookupAt(xy: Float64Array, offset: number): number {
    const x = xy[offset];
    const y = xy[offset + 1];
    const grid = this.grid;
    if (x >= grid.minX && y >= grid.minY && x <= grid.maxX && y <= grid.maxY) {
      const i = Math.min(grid.nx - 1, Math.floor((x - grid.minX) * grid.invCell));
      const j = Math.min(grid.ny - 1, Math.floor((y - grid.minY) * grid.invCell));
      const cell = i * grid.ny + j;
      const box = this.patchBox;
      // Each cell lists its patches from last to first: the first that holds the point wins.
      for (let k = grid.cellStart[cell], end = grid.cellStart[cell + 1]; k < end; k++) {
        const p = grid.cellPatch[k];
        const b = 4 * p;
        if (x < box[b] || y < box[b + 1] || x > box[b + 2] || y > box[b + 3]) continue;
        const kind = this.patchKind[p];
        if (kind === KIND_RECT) return p + 1;
        if (kind === KIND_CIRCLE) {
          const dx = x - this.patchCircle[3 * p];
          const dy = y - this.patchCircle[3 * p + 1];
          if (dx * dx + dy * dy <= this.patchCircle[3 * p + 2]) return p + 1;
        } else if (this.insidePolygon(p, x, y)) {
          return p + 1;
        }
      }
    }
    if (this.hasRaster) {
      const i = Math.floor((x - this.rasterOriginX) * this.rasterInvCell);
      const j = Math.floor((y - this.rasterOriginY) * this.rasterInvCell);
      if (i >= 0 && j >= 0 && i < this.rasterNx && j < this.rasterNy) {
        return this.rasterMaterial[i * this.rasterNy + j];
      }
    }
    return 0;
  }

  /** Even–odd crossing test (Shimrat 1962, "Algorithm 112"; boundary points count as inside). */
  private insidePolygon(p: number, x: number, y: number): boolean {
    const xy = this.polygonXY;
    const offset = this.polygonOffset[p];
    const n = this.polygonCount[p];
    let inside = false;
    for (let a = 0, b = n - 1; a < n; b = a++) {
      const xa = xy[offset + 2 * a];
      const ya = xy[offset + 2 * a + 1];
      const xb = xy[offset + 2 * b];
      const yb = xy[offset + 2 * b + 1];
      if (ya > y !== yb > y) {
        const xCross = xa + ((y - ya) * (xb - xa)) / (yb - ya);
        if (x === xCross) return true;
        if (x < xCross) inside = !inside;
      }
    }
    return inside;
  }
}

/** Uniform grid over the patches' joint bounding box; cell (i, j) lists the patches touching it. */
interface PatchGrid {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
  invCell: number;
  nx: number;
  ny: number;
  /** Patches of cell c: cellPatch[cellStart[c] … cellStart[c + 1]), highest index first. */
  cellStart: Int32Array;
  cellPatch: Int32Array;
}

/**
 * About two cells per patch, at most 2^16 cells: a patch then touches a few cells and a cell holds
 * a few patches for scattered floors (common practice for uniform grids); large patches that
 * cover many cells cost memory at build time only (one int per cell they touch).
 */
const CELLS_PER_PATCH = 2;
const MAX_CELLS = 1 << 16;

function buildPatchGrid(box: Float64Array, count: number): PatchGrid {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (let p = 0; p < count; p++) {
    minX = Math.min(minX, box[4 * p]);
    minY = Math.min(minY, box[4 * p + 1]);
    maxX = Math.max(maxX, box[4 * p + 2]);
    maxY = Math.max(maxY, box[4 * p + 3]);
  }
  if (count === 0) return { minX: 1, minY: 1, maxX: 0, maxY: 0, invCell: 0, nx: 1, ny: 1, cellStart: new Int32Array(2), cellPatch: new Int32Array(0) };
  const width = Math.max(maxX - minX, 1e-9);
  const height = Math.max(maxY - minY, 1e-9);
  const cells = Math.min(MAX_CELLS, CELLS_PER_PATCH * count);
  const cell = Math.max(Math.sqrt((width * height) / cells), Math.max(width, height) / cells);
  const nx = Math.max(1, Math.min(cells, Math.ceil(width / cell)));
  const ny = Math.max(1, Math.min(cells, Math.ceil(height / cell)));
  const invCell = 1 / cell;
  const column = (x: number) => Math.min(nx - 1, Math.max(0, Math.floor((x - minX) * invCell)));
  const row = (y: number) => Math.min(ny - 1, Math.max(0, Math.floor((y - minY) * invCell)));
  // Two passes (count, then fill) into compressed rows; patches visited last to first.
  const cellStart = new Int32Array(nx * ny + 1);
  for (let p = 0; p < count; p++) {
    for (let i = column(box[4 * p]); i <= column(box[4 * p + 2]); i++) {
      for (let j = row(box[4 * p + 1]); j <= row(box[4 * p + 3]); j++) cellStart[i * ny + j + 1]++;
    }
  }
  for (let c = 0; c < nx * ny; c++) cellStart[c + 1] += cellStart[c];
  const fill = cellStart.slice(0, nx * ny);
  const cellPatch = new Int32Array(cellStart[nx * ny]);
  for (let p = count - 1; p >= 0; p--) {
    for (let i = column(box[4 * p]); i <= column(box[4 * p + 2]); i++) {
      for (let j = row(box[4 * p + 1]); j <= row(box[4 * p + 3]); j++) cellPatch[fill[i * ny + j]++] = p;
    }
  }
  return { minX, minY, maxX, maxY, invCell, nx, ny, cellStart, cellPatch };
}
