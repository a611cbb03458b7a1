import { Op, type Transaction } from 'sequelize';
import { User } from '../users/user.model';
import { OncallContact, OncallCover, OncallPolicy, OncallShift } from './oncall.model';
import { badRequest, notFound } from '../../lib/errors';
import type { AppDeps } from '../../lib/http';
import { getFacilitySettings } from '../settings/settings.service';
import { DEFAULT_STEP_MINUTES, SEVERITIES, WEEK_MS, whoHolds, type Duty, type Severity } from '../../../shared/oncall';
import type { CoverView, PolicyView, RotaStretch, RotaView, ShiftView } from '../../../shared/schemas/oncall';
import type { z } from 'zod';
import type { coverInput, policyInput, shiftInput } from '../../../shared/schemas/oncall';
import type { SmsMode } from '../../lib/sms';

type Named = { id: number; name: string };
const person = (u: Named | undefined | null) => (u ? { id: u.id, name: u.name } : null);

async function names(ids: (number | null)[], transaction?: Transaction) {
  const list = [...new Set(ids.filter((x): x is number => x !== null))];
  const users = list.length ? await User.findAll({ where: { id: list }, attributes: ['id', 'name'], transaction }) : [];
  return new Map(users.map((u) => [u.id, u]));
}

/** Rota rows that may matter for instants in [from, to): one indexed read, expanded in memory. */
async function rotaRows(from: Date, to: Date, transaction?: Transaction) {
  const [shifts, covers] = await Promise.all([
    OncallShift.findAll({
      where: {
        startsAt: { [Op.lt]: to },
        [Op.or]: [
          { endsAt: { [Op.gt]: from } },
          { weekly: true, [Op.or]: [{ repeatUntil: null }, { repeatUntil: { [Op.gt]: new Date(from.getTime() - WEEK_MS) } }] },
        ],
      },
      transaction,
    }),
    OncallCover.findAll({ where: { startsAt: { [Op.lt]: to }, endsAt: { [Op.gt]: from } }, transaction }),
  ]);
  return { shifts, covers };
}

/** Who holds each duty at `at` (null where the rota has a gap). */
export async function holdersAt(at: Date, transaction?: Transaction): Promise<Record<Duty, number | null>> {
  const { shifts, covers } = await rotaRows(at, new Date(at.getTime() + 1), transaction);
  return { on_call: whoHolds('on_call', shifts, covers, at), backup: whoHolds('backup', shifts, covers, at) };
}

/**
 * Who gets the on-call mail for a hazard or safety alarm: the person the rota has on call now.
 * Where the rota has a gap, the people flagged "on call" on the users page are told instead,
 * so a hole in the rota never silences a safety notice.
 */
export async function onCallRecipients(at: Date, transaction?: Transaction): Promise<number[]> {
  const { on_call } = await holdersAt(at, transaction);
  if (on_call !== null) {
    const active = await User.findOne({ where: { id: on_call, active: true }, attributes: ['id'], transaction });
    if (active) return [active.id];
  }
  const flagged = await User.findAll({ where: { onCall: true, active: true }, attributes: ['id'], transaction });
  return flagged.map((u) => u.id);
}

export async function policyFor(deps: AppDeps, severity: Severity, transaction?: Transaction) {
  const row = await OncallPolicy.findByPk(severity, { transaction });
  return {
    severity,
    stepMinutes: row?.stepMinutes ?? deps.config.ONCALL_STEP_MINUTES ?? DEFAULT_STEP_MINUTES,
    managerId: row?.managerId ?? null,
    // Other P1 tickets page at night only; until an admin sets the window it is 22:00–06:00.
    nightStarts: severity === 'p1' ? (row ? row.nightStarts : '22:00') : null,
    nightEnds: severity === 'p1' ? (row ? row.nightEnds : '06:00') : null,
  };
}

async function requireStaff(userId: number, field = 'userId', minimum: 'technician' | 'manager' = 'technician') {
  const roles = minimum === 'manager' ? ['manager', 'admin'] : ['technician', 'manager', 'admin'];
  const u = await User.findOne({ where: { id: userId, active: true, role: roles }, attributes: ['id', 'name'] });
  if (!u)
    throw badRequest('Choose an active staff member.', {
      [field]: [minimum === 'manager' ? 'Not an active manager or admin.' : 'Not an active technician, manager or admin.'],
    });
  return u;
}

export async function createShift(input: z.output<typeof shiftInput>) {
  await requireStaff(input.userId);
  const row = await OncallShift.create({ ...input, repeatUntil: input.weekly ? input.repeatUntil : null });
  return { id: row.id };
}

export async function deleteShift(id: number) {
  if ((await OncallShift.destroy({ where: { id } })) === 0) throw notFound('That shift');
}

export async function createCover(input: z.output<typeof coverInput>) {
  await requireStaff(input.userId);
  const row = await OncallCover.create(input);
  return { id: row.id };
}

export async function deleteCover(id: number) {
  if ((await OncallCover.destroy({ where: { id } })) === 0) throw notFound('That cover');
}

export async function savePolicy(deps: AppDeps, severity: Severity, input: z.output<typeof policyInput>) {
  if (input.managerId !== null) await requireStaff(input.managerId, 'managerId', 'manager');
  if (severity === 'p1' && (input.nightStarts === null) !== (input.nightEnds === null))
    throw badRequest('Give both ends of the night window, or neither.', {
      [input.nightStarts === null ? 'nightStarts' : 'nightEnds']: ['Give this time too.'],
    });
  // Hazards page at any hour; only the P1 policy has a window.
  const window =
    severity === 'p1' ? { nightStarts: input.nightStarts, nightEnds: input.nightEnds } : { nightStarts: null, nightEnds: null };
  await OncallPolicy.upsert({ severity, stepMinutes: input.stepMinutes, managerId: input.managerId, ...window });
  return policyFor(deps, severity);
}

export async function setContact(userId: number, phone: string) {
  await requireStaff(userId);
  await OncallContact.upsert({ userId, phone });
}

export async function removeContact(userId: number) {
  await OncallContact.destroy({ where: { userId } });
}

/** The admin page: every shift and cover still in force, the policies, numbers, and who holds what over the coming days. */
export async function rotaView(deps: AppDeps, opts: { from: Date; days: number; smsMode: SmsMode }): Promise<RotaView> {
  const to = new Date(opts.from.getTime() + opts.days * 86_400_000);
  const now = new Date();
  const { shifts, covers } = await rotaRows(new Date(Math.min(now.getTime(), opts.from.getTime())), to);
  const staff = await User.findAll({
    where: { active: true, role: ['technician', 'manager', 'admin'] },
    attributes: ['id', 'name', 'role'],
    order: [['name', 'ASC']],
    limit: 500,
  });
  const contacts = await OncallContact.findAll({ where: { userId: staff.map((s) => s.id) } });
  const policies = await Promise.all(SEVERITIES.map((s) => policyFor(deps, s)));
  const people = await names([...shifts.map((s) => s.userId), ...covers.map((c) => c.userId), ...policies.map((p) => p.managerId)]);

  // The stretches: cut the period wherever any turn or cover begins or ends.
  const cuts = new Set<number>([opts.from.getTime(), to.getTime()]);
  for (const s of shifts) {
    const length = s.endsAt.getTime() - s.startsAt.getTime();
    const first = s.weekly ? Math.max(0, Math.floor((opts.from.getTime() - s.startsAt.getTime()) / WEEK_MS) - 1) : 0;
    for (let k = first; ; k++) {
      const start = s.startsAt.getTime() + k * WEEK_MS;
      if (start >= to.getTime() || (s.repeatUntil && start >= s.repeatUntil.getTime())) break;
      for (const t of [start, start + length]) if (t > opts.from.getTime() && t < to.getTime()) cuts.add(t);
      if (!s.weekly) break;
    }
  }
  for (const c of covers)
    for (const t of [c.startsAt.getTime(), c.endsAt.getTime()]) if (t > opts.from.getTime() && t < to.getTime()) cuts.add(t);
  const points = [...cuts].sort((a, b) => a - b);
  const upcoming: RotaStretch[] = [];
  for (let i = 0; i + 1 < points.length; i++) {
    const at = new Date(points[i]);
    const onCall = person(people.get(whoHolds('on_call', shifts, covers, at) ?? -1));
    const backup = person(people.get(whoHolds('backup', shifts, covers, at) ?? -1));
    const last = upcoming[upcoming.length - 1];
    if (last && last.onCall?.id === onCall?.id && last.backup?.id === backup?.id) last.to = new Date(points[i + 1]).toISOString();
    else upcoming.push({ from: at.toISOString(), to: new Date(points[i + 1]).toISOString(), onCall, backup });
  }

  const shiftViews: ShiftView[] = shifts
    .filter((s) => s.weekly || s.endsAt > now)
    .map((s) => ({
      id: s.id,
      person: person(people.get(s.userId))!,
      duty: s.duty,
      startsAt: s.startsAt.toISOString(),
      endsAt: s.endsAt.toISOString(),
      weekly: s.weekly,
      repeatUntil: s.repeatUntil?.toISOString() ?? null,
    }))
    .sort((a, b) => a.startsAt.localeCompare(b.startsAt));
  const coverViews: CoverView[] = covers
    .filter((c) => c.endsAt > now)
    .map((c) => ({
      id: c.id,
      person: person(people.get(c.userId))!,
      duty: c.duty,
      startsAt: c.startsAt.toISOString(),
      endsAt: c.endsAt.toISOString(),
      note: c.note,
    }))
    .sort((a, b) => a.startsAt.localeCompare(b.startsAt));
  const policyViews: PolicyView[] = policies.map((p) => ({
    severity: p.severity,
    stepMinutes: p.stepMinutes,
    manager: person(people.get(p.managerId ?? -1)),
    nightStarts: p.nightStarts,
    nightEnds: p.nightEnds,
  }));
  const phoneOf = new Map(contacts.map((c) => [c.userId, c.phone]));
  const held = { on_call: whoHolds('on_call', shifts, covers, now), backup: whoHolds('backup', shifts, covers, now) };
  return {
    shifts: shiftViews,
    covers: coverViews,
    policies: policyViews,
    contacts: staff.map((s) => ({ person: { id: s.id, name: s.name, role: s.role }, phone: phoneOf.get(s.id) ?? null })),
    now: { onCall: person(people.get(held.on_call ?? -1)), backup: person(people.get(held.backup ?? -1)) },
    upcoming,
    timeZone: (await getFacilitySettings(deps)).timeZone,
    smsMode: opts.smsMode,
  };
}
