// Plane geometry for patch checks: segment intersection by orientation tests (Cormen, Leiserson,
// Rivest & Stein, Introduction to Algorithms, §33.1) and the shoelace area.

export type Point = readonly [number, number];

function cross(o: Point, a: Point, b: Point): number {
  return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
}

function onSegment(p: Point, q: Point, r: Point): boolean {
  return Math.min(p[0], q[0]) <= r[0] && r[0] <= Math.max(p[0], q[0]) && Math.min(p[1], q[1]) <= r[1] && r[1] <= Math.max(p[1], q[1]);
}

/** True when closed segments p1p2 and p3p4 share at least one point. */
export function segmentsIntersect(p1: Point, p2: Point, p3: Point, p4: Point): boolean {
  const d1 = cross(p3, p4, p1);
  const d2 = cross(p3, p4, p2);
  const d3 = cross(p1, p2, p3);
  const d4 = cross(p1, p2, p4);
  if (((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0))) return true;
  if (d1 === 0 && onSegment(p3, p4, p1)) return true;
  if (d2 === 0 && onSegment(p3, p4, p2)) return true;
  if (d3 === 0 && onSegment(p1, p2, p3)) return true;
  if (d4 === 0 && onSegment(p1, p2, p4)) return true;
  return false;
}

export function shoelaceArea(vertices: readonly Point[]): number {
  let twice = 0;
  for (let i = 0; i < vertices.length; i++) {
    const a = vertices[i];
    const b = vertices[(i + 1) % vertices.length];
    twice += a[0] * b[1] - b[0] * a[1];
  }
  return twice / 2;
}

/** Why a polygon is not simple, or undefined when it is (edge k runs from vertex k to k+1). */
export function polygonProblem(vertices: readonly Point[]): { message: string; vertex: number } | undefined {
  const n = vertices.length;
  const same = (a: Point, b: Point) => a[0] === b[0] && a[1] === b[1];
  if (n >= 2 && same(vertices[0], vertices[n - 1])) {
    return { vertex: n - 1, message: `the last vertex repeats the first (the polygon closes itself; leave the repeat out)` };
  }
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      if (same(vertices[i], vertices[j])) return { vertex: j, message: `vertices ${i} and ${j} are the same point [${vertices[i].join(', ')}] (expected a simple polygon)` };
    }
  }
  for (let k = 0; k < n; k++) {
    const a = vertices[k];
    const b = vertices[(k + 1) % n];
    const c = vertices[(k + 2) % n];
    // Adjacent edges only meet at their shared vertex unless they fold back onto each other.
    if (cross(a, b, c) === 0 && (b[0] - a[0]) * (c[0] - b[0]) + (b[1] - a[1]) * (c[1] - b[1]) < 0) {
      return { vertex: (k + 1) % n, message: `edges ${k} and ${(k + 1) % n} fold back onto each other at vertex ${(k + 1) % n} (expected a simple polygon)` };
    }
  }
  for (let k = 0; k < n; k++) {
    for (let l = k + 2; l < n; l++) {
      if (k === 0 && l === n - 1) continue; // these two share vertex 0
      if (segmentsIntersect(vertices[k], vertices[(k + 1) % n], vertices[l], vertices[(l + 1) % n])) {
        return { vertex: l, message: `edges ${k} (vertex ${k}→${(k + 1) % n}) and ${l} (vertex ${l}→${(l + 1) % n}) cross (expected a simple polygon whose edges do not cross)` };
      }
    }
  }
  if (shoelaceArea(vertices) === 0) return { vertex: 0, message: 'the polygon has zero area (all vertices on one line)' };
  return undefined;
}
