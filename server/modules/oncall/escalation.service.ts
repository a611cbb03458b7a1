import crypto from 'node:crypto';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { User } from '../users/user.model';
import { OncallContact, OncallEscalation, OncallPage, SmsInbound, SmsOutbox } from './oncall.model';
import { holdersAt, policyFor } from './rota.service';
import { queueMail } from '../../lib/mailer';
import { queueSms } from '../../lib/sms';
import { createNotices } from '../notices/notices.service';
import { recordPageAcknowledged } from '../tickets/page-acknowledgement';
import { getFacilitySettings } from '../settings/settings.service';
import { AppError, notFound } from '../../lib/errors';
import type { AppDeps, AuthUser } from '../../lib/http';
import { inNightWindow, replyCodeFrom, STEPS, STEP_LABELS, type Severity, type Step } from '../../../shared/oncall';
import type { EscalationView, TicketPagesView } from '../../../shared/schemas/oncall';
import { isStaff } from '../../../shared/roles';

/** A page's link works this long (and once). */
const PAGE_LINK_MS = 24 * 3_600_000;
const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');

export interface EscalationStart {
  ticketId: number;
  toolId: number;
  severity: Severity;
  /** One line for the text message, e.g. "Safety report: smell at ICP etcher 2 (ICP-2)". */
  headline: string;
  /** The mail's body: what happened and the cautions. */
  details: string;
}

/** Whether a P1 ticket (not a hazard) pages now: only inside the night window, facility time. */
export async function pagesAtThisHour(deps: AppDeps, at: Date, transaction?: Transaction) {
  const [policy, settings] = await Promise.all([policyFor(deps, 'p1', transaction), getFacilitySettings(deps, transaction)]);
  return inNightWindow(at, settings.timeZone, policy.nightStarts, policy.nightEnds);
}

/**
 * Starts paging for a ticket, in the caller's transaction: the first step's pages, texts and
 * mail commit with the ticket change. A ticket already being escalated is left as it is.
 * Returns who was paged (they need no second mail about the same thing).
 */
export async function startEscalation(deps: AppDeps, input: EscalationStart, transaction: Transaction, now = new Date()) {
  const running = await OncallEscalation.findOne({ where: { openTicketId: input.ticketId }, transaction, lock: transaction.LOCK.UPDATE });
  if (running) return [];
  const policy = await policyFor(deps, input.severity, transaction);
  const esc = await OncallEscalation.create(
    {
      ticketId: input.ticketId,
      toolId: input.toolId,
      openTicketId: input.ticketId,
      severity: input.severity,
      status: 'open',
      step: 0,
      stepMinutes: policy.stepMinutes,
      nextStepAt: null,
      headline: input.headline.slice(0, 300),
      details: input.details,
    },
    { transaction },
  );
  return pageFrom(deps, esc, 0, now, transaction);
}

/**
 * Who a step pages: the rota's holder of the duty; for the first step in a gap of the rota, the
 * people flagged "on call" on the users page (so a hole in the rota never silences a hazard);
 * for the last step, the manager the policy names (none named: the step is skipped).
 */
async function peopleFor(deps: AppDeps, esc: OncallEscalation, step: Step, at: Date, transaction: Transaction) {
  const attributes = ['id', 'name', 'email'];
  if (step === 'manager') {
    const policy = await policyFor(deps, esc.severity, transaction);
    return policy.managerId ? User.findAll({ where: { id: policy.managerId, active: true }, attributes, transaction }) : [];
  }
  const holder = (await holdersAt(at, transaction))[step];
  if (holder !== null) return User.findAll({ where: { id: holder, active: true }, attributes, transaction });
  if (step === 'on_call')
    return User.findAll({ where: { onCall: true, active: true }, attributes, order: [['id', 'ASC']], limit: 20, transaction });
  return [];
}

/**
 * Pages the first step from `index` on that has somebody (a gap in the rota moves straight to
 * the next step, so no minutes are lost on nobody). After the last step's wait the escalation
 * is marked unanswered.
 */
async function pageFrom(deps: AppDeps, esc: OncallEscalation, index: number, now: Date, transaction: Transaction): Promise<number[]> {
  for (let i = index; i < STEPS.length; i++) {
    const people = await peopleFor(deps, esc, STEPS[i], now, transaction);
    if (people.length === 0) continue;
    await sendPages(deps, esc, i, people, now, transaction);
    esc.step = i;
    esc.nextStepAt = new Date(now.getTime() + esc.stepMinutes * 60_000);
    await esc.save({ transaction });
    announce(deps, esc, transaction);
    return people.map((p) => p.id);
  }
  esc.status = 'unanswered';
  esc.openTicketId = null;
  esc.nextStepAt = null;
  await esc.save({ transaction });
  announce(deps, esc, transaction);
  return [];
}

function announce(deps: AppDeps, esc: OncallEscalation, transaction: Transaction) {
  // Pages are staff-only detail; the ticket page refetches them.
  deps.events.publish(
    { type: 'ticket.updated', audience: { ticket: esc.ticketId, staffOnly: true }, payload: { id: esc.ticketId, toolId: esc.toolId } },
    transaction,
  );
}

async function sendPages(
  deps: AppDeps,
  esc: OncallEscalation,
  stepIndex: number,
  people: Pick<User, 'id' | 'name' | 'email'>[],
  now: Date,
  transaction: Transaction,
) {
  const contacts = await OncallContact.findAll({ where: { userId: people.map((p) => p.id) }, transaction });
  const phoneOf = new Map(contacts.map((c) => [c.userId, c.phone]));
  const step = STEPS[stepIndex];
  const texts = [];
  const mails = [];
  for (const p of people) {
    const token = crypto.randomBytes(24).toString('base64url');
    const page = await OncallPage.create(
      {
        escalationId: esc.id,
        step: stepIndex,
        userId: p.id,
        phone: phoneOf.get(p.id) ?? null,
        replyCode: replyCodeFrom(crypto.randomBytes(2)),
        tokenHash: sha256(token),
        createdAt: now,
      },
      { transaction },
    );
    const link = `${deps.config.publicUrl}/page/${token}`;
    const later = stepIndex > 0 ? ' Nobody answered the earlier page.' : '';
    if (page.phone)
      texts.push({
        to: page.phone,
        idempotencyKey: `page-${page.id}`,
        text:
          `Faultline page, ticket #${esc.ticketId} (${STEP_LABELS[step].toLowerCase()}): ${esc.headline}.${later} ` +
          `Follow the facility's procedures; this text does not replace alarms or emergency response. ` +
          `Acknowledge: ${link} or reply ${page.replyCode}`,
      });
    mails.push({
      to: p.email,
      subject: `Page: ${esc.headline} — #${esc.ticketId}`.slice(0, 255),
      text: [
        `Hello ${p.name},`,
        '',
        `You are paged as ${STEP_LABELS[step].toLowerCase()} for ticket #${esc.ticketId}.${later}`,
        '',
        esc.details,
        '',
        `Acknowledge the page (one use): ${link}`,
        page.phone ? `Or reply ${page.replyCode} to the text message.` : null,
        `Open the ticket: ${deps.config.publicUrl}/tickets/${esc.ticketId}`,
        '',
        'Faultline records and passes on reports; it does not replace the facility’s alarm systems or emergency response.',
        '— Faultline',
      ]
        .filter((l) => l !== null)
        .join('\n'),
    });
  }
  await queueSms(texts, transaction);
  await queueMail(mails, transaction);
  await createNotices(
    deps,
    people.map((p) => p.id),
    {
      kind: 'oncall.page',
      title: `Page: ${esc.headline} — #${esc.ticketId}`,
      body: esc.details,
      link: `/tickets/${esc.ticketId}`,
      push: true,
    },
    transaction,
  );
}

/**
 * One pass of the escalation clock: every open escalation whose wait ran out pages its next
 * step. Rows are claimed with FOR UPDATE SKIP LOCKED, so several processes never page twice.
 * Tests call it with a clock instead of waiting.
 */
export async function runEscalationPass(deps: AppDeps, now = new Date()): Promise<number> {
  let advanced = 0;
  for (;;) {
    const done = await deps.sequelize.transaction(async (transaction) => {
      const due = await OncallEscalation.findAll({
        where: { status: 'open', nextStepAt: { [Op.lte]: now } },
        order: [['nextStepAt', 'ASC']],
        limit: 20,
        lock: transaction.LOCK.UPDATE,
        skipLocked: true,
        transaction,
      });
      for (const esc of due) await pageFrom(deps, esc, esc.step + 1, now, transaction);
      return due.length;
    });
    advanced += done;
    if (done < 20) return advanced;
  }
}

export function startEscalationClock(deps: AppDeps, everyMs: number) {
  let running: Promise<unknown> = Promise.resolve();
  const timer = setInterval(() => {
    running = running.then(() => runEscalationPass(deps)).catch((err) => deps.log.warn({ err: String(err) }, 'escalation pass failed'));
  }, everyMs);
  timer.unref();
  return {
    async stop() {
      clearInterval(timer);
      await running;
    },
  };
}

/** Stops an escalation (once: the conditional update lets exactly one answer win) and tells the ticket. */
async function acknowledge(
  deps: AppDeps,
  escalationId: number,
  userId: number,
  via: 'link' | 'sms' | 'app',
  transaction: Transaction,
  now = new Date(),
) {
  const [, affected] = await deps.sequelize.query(
    `UPDATE oncall_escalations
        SET status = 'acknowledged', open_ticket_id = NULL, next_step_at = NULL,
            acknowledged_at = :now, acknowledged_by = :userId, acknowledged_via = :via, updated_at = :now
      WHERE id = :escalationId AND status IN ('open', 'unanswered')`,
    { type: QueryTypes.UPDATE, replacements: { now, userId, via, escalationId }, transaction },
  );
  if (Number(affected) !== 1) return null;
  const esc = (await OncallEscalation.findByPk(escalationId, { transaction }))!;
  const page = await OncallPage.findOne({ where: { escalationId, userId }, order: [['id', 'DESC']], transaction });
  await recordPageAcknowledged(deps, { ticketId: esc.ticketId, userId, via, step: page ? STEPS[page.step] : 'app', at: now }, transaction);
  announce(deps, esc, transaction);
  return esc;
}

/** The link in a page: single use (one conditional UPDATE), valid for a day. */
export async function acknowledgeByLink(deps: AppDeps, token: string) {
  return deps.sequelize.transaction(async (transaction) => {
    const now = new Date();
    const tokenHash = sha256(token);
    const [, affected] = await deps.sequelize.query(
      `UPDATE oncall_pages SET link_used_at = :now WHERE token_hash = :tokenHash AND link_used_at IS NULL AND created_at > :oldest`,
      { type: QueryTypes.UPDATE, replacements: { now, tokenHash, oldest: new Date(now.getTime() - PAGE_LINK_MS) }, transaction },
    );
    if (Number(affected) !== 1)
      throw new AppError(410, 'page_link_used', 'This page link was used already or is too old. Open the ticket to see who answered.');
    const page = (await OncallPage.findOne({ where: { tokenHash }, transaction }))!;
    const esc = await OncallEscalation.findByPk(page.escalationId, { transaction });
    const stopped = await acknowledge(deps, page.escalationId, page.userId, 'link', transaction, now);
    return { ticketId: esc!.ticketId, acknowledged: stopped !== null };
  });
}

/** Acknowledging on the ticket page, for someone who was paged. */
export async function acknowledgeInApp(deps: AppDeps, user: AuthUser, ticketId: number) {
  return deps.sequelize.transaction(async (transaction) => {
    const esc = await OncallEscalation.findOne({
      where: { ticketId, status: ['open', 'unanswered'] },
      order: [['id', 'DESC']],
      transaction,
    });
    if (!esc) throw new AppError(409, 'nothing_to_acknowledge', 'No page is waiting for an answer on this ticket.');
    const paged = await OncallPage.findOne({ where: { escalationId: esc.id, userId: user.id }, transaction });
    if (!paged) throw new AppError(403, 'forbidden', 'Only someone who was paged can acknowledge the page.');
    const stopped = await acknowledge(deps, esc.id, user.id, 'app', transaction);
    if (!stopped) throw new AppError(409, 'nothing_to_acknowledge', 'Someone answered the page in the meantime.');
    return { ticketId };
  });
}

/**
 * A text from the provider's webhook (signature already checked). Each provider event counts
 * once. A reply from a paged number acknowledges that number's latest unanswered page (the one
 * whose code the reply names, if it names one). Anything else is recorded and left alone.
 */
export async function receiveText(deps: AppDeps, event: { id: string; type: string; from: string; text: string }) {
  if (event.type !== 'message.received') return { handled: false };
  return deps.sequelize.transaction(async (transaction) => {
    const [inbound, created] = await SmsInbound.findOrCreate({
      where: { eventId: event.id },
      defaults: { eventId: event.id, fromNumber: event.from.slice(0, 20), body: event.text.slice(0, 1000), pageId: null },
      transaction,
    });
    if (!created) return { handled: false };
    const now = new Date();
    const pages = await OncallPage.findAll({
      where: { phone: event.from, createdAt: { [Op.gt]: new Date(now.getTime() - PAGE_LINK_MS) } },
      include: [{ model: OncallEscalation, as: 'escalation', where: { status: ['open', 'unanswered'] }, required: true }],
      order: [['id', 'DESC']],
      limit: 20,
      transaction,
    });
    const code = /\b(\d{4})\b/.exec(event.text)?.[1];
    const page = (code && pages.find((p) => p.replyCode === code)) || pages[0];
    if (!page) return { handled: false };
    await inbound.update({ pageId: page.id }, { transaction });
    const stopped = await acknowledge(deps, page.escalationId, page.userId, 'sms', transaction, now);
    return { handled: stopped !== null };
  });
}

/** The pages of a ticket, for its page (staff only: names, steps, number endings). */
export async function ticketPages(user: AuthUser, ticketId: number): Promise<TicketPagesView> {
  if (!isStaff(user.role)) throw notFound('That ticket');
  const escalations = await OncallEscalation.findAll({ where: { ticketId }, order: [['id', 'ASC']], limit: 20 });
  const pages = escalations.length
    ? await OncallPage.findAll({ where: { escalationId: escalations.map((e) => e.id) }, order: [['id', 'ASC']], limit: 200 })
    : [];
  const texts = pages.length
    ? await SmsOutbox.findAll({ where: { idempotencyKey: pages.map((p) => `page-${p.id}`) }, attributes: ['idempotencyKey', 'sentAt'] })
    : [];
  const sentAt = new Map(texts.map((t) => [t.idempotencyKey, t.sentAt]));
  const ids = [
    ...new Set([...pages.map((p) => p.userId), ...escalations.map((e) => e.acknowledgedBy).filter((x): x is number => x !== null)]),
  ];
  const users = ids.length ? await User.findAll({ where: { id: ids }, attributes: ['id', 'name'] }) : [];
  const nameOf = new Map(users.map((u) => [u.id, { id: u.id, name: u.name }]));
  const views: EscalationView[] = escalations.map((e) => ({
    id: e.id,
    severity: e.severity,
    status: e.status,
    startedAt: e.createdAt.toISOString(),
    stepMinutes: e.stepMinutes,
    nextStepAt: e.status === 'open' ? (e.nextStepAt?.toISOString() ?? null) : null,
    nextStep: e.status === 'open' ? (STEPS[e.step + 1] ?? null) : null,
    acknowledgedAt: e.acknowledgedAt?.toISOString() ?? null,
    acknowledgedBy: e.acknowledgedBy ? (nameOf.get(e.acknowledgedBy) ?? null) : null,
    acknowledgedVia: e.acknowledgedVia,
    pages: pages
      .filter((p) => p.escalationId === e.id)
      .map((p) => ({
        id: p.id,
        step: STEPS[p.step],
        person: nameOf.get(p.userId) ?? { id: p.userId, name: 'Unknown' },
        phoneEnd: p.phone ? p.phone.slice(-3) : null,
        sentAt: p.createdAt.toISOString(),
        textSentAt: sentAt.get(`page-${p.id}`)?.toISOString() ?? null,
      })),
  }));
  const open = escalations.filter((e) => e.status !== 'acknowledged').map((e) => e.id);
  return { escalations: views, mayAcknowledge: pages.some((p) => open.includes(p.escalationId) && p.userId === user.id) };
}
