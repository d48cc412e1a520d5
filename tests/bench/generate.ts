/**
 * Deterministic lesson inputs for the engine benchmark: a seeded generator (mulberry32), never
 * Math.random, so every run times the same work. The data is invented.
 */
import type { PrepInput } from '../../shared/prep/index.js';

/** mulberry32: a small seeded 32-bit generator; returns floats in [0, 1). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export interface LessonShape {
  /** Number of groups (at most 60: a class has at most 60 students). */
  groups: number;
  /** Distinct parts each group needs (part lines per group). */
  lines: number;
  tubs: number;
  seed: number;
}

const KINDS = ['intro', 'build', 'code', 'test'] as const;

/** A lesson of exactly `groups` groups, each needing `lines` parts, over `tubs` ready tubs. */
export function generateLesson(shape: LessonShape): PrepInput {
  const rnd = seededRandom(shape.seed);
  const int = (lo: number, hi: number) => lo + Math.floor(rnd() * (hi - lo + 1));
  const groupSize = Math.max(1, Math.min(4, Math.floor(60 / shape.groups)));
  const students = shape.groups * groupSize;
  const parts = Array.from({ length: shape.lines }, (_, i) => ({
    code: `BX-${String(i + 1).padStart(4, '0')}`,
    name: `Invented part ${i + 1}`,
    category: i === 0 ? 'controller' : i % 7 === 0 ? 'motor' : 'beam',
    small: i % 2 === 1,
    fullChargeMinutes: i === 0 ? 180 : null,
  }));
  const activities = KINDS.map((kind, k) => ({
    title: `Activity ${k + 1}`,
    kind,
    minutes: 10,
    materials: [] as {
      partCode?: string;
      consumable?: string;
      qty: number;
      per: 'group' | 'student' | 'class';
    }[],
  }));
  // Each part in one activity, one in ten again in another (so the maximum over activities
  // matters), and a few class-tray parts and consumables.
  const perGroupNeed: number[] = [];
  parts.forEach((p, i) => {
    const perStudent = i % 3 === 0;
    const qty = int(1, 3);
    activities[i % KINDS.length]!.materials.push({
      partCode: p.code,
      qty,
      per: perStudent ? 'student' : 'group',
    });
    perGroupNeed.push(perStudent ? qty * groupSize : qty);
    if (i % 10 === 0) {
      activities[(i + 1) % KINDS.length]!.materials.push({ partCode: p.code, qty, per: 'group' });
    }
    if (i % 25 === 0) {
      activities[(i + 2) % KINDS.length]!.materials.push({
        partCode: p.code,
        qty: 2,
        per: 'class',
      });
    }
  });
  activities[1]!.materials.push({ consumable: 'Masking tape (cm)', qty: 20, per: 'group' });
  activities[0]!.materials.push({ consumable: 'Sticky notes', qty: 2, per: 'student' });
  // Stock a little above what the groups homed on a tub need, with some pieces missing, so a
  // few parts are borrowed between tubs and one part in forty runs short for the lesson.
  const groupsPerTub = Math.ceil(shape.groups / shape.tubs);
  const tubs = Array.from({ length: shape.tubs }, (_, t) => {
    const stock: Record<string, number> = {};
    parts.forEach((p, i) => {
      const full = perGroupNeed[i]! * groupsPerTub + (i % 25 === 0 ? 4 : 0);
      // Pieces known missing: now and then one, and one part in forty badly depleted.
      const lost = i % 40 === 39 ? Math.ceil(full / 2) : rnd() < 0.15 ? 1 : 0;
      stock[p.code] = full + int(0, 2) - lost;
    });
    return { id: `tub-${t + 1}`, label: `Tub ${t + 1}`, status: 'ready' as const, stock };
  });
  return {
    timezone: 'Australia/Adelaide',
    lesson: { startsAt: '2026-07-28T11:10', endsAt: '2026-07-28T12:00', groupSize },
    class: { studentCount: students, devices: shape.groups },
    parts,
    tubs,
    activities,
  };
}
