import { Op } from 'sequelize';
import { OutboxMail } from '../../lib/outbox.model';
import { activeAdmins } from '../users/user-directory';
import { createNotices } from '../notices/notices.service';
import { AppError } from '../../lib/errors';
import { MAIL_LATE_AFTER_MS } from '../../lib/mailer';
import type { AppDeps } from '../../lib/http';
import type { LateMail, LateMailList } from '../../../shared/schemas/mail';

const lateWhere = () => ({ status: 'pending' as const, createdAt: { [Op.lte]: new Date(Date.now() - MAIL_LATE_AFTER_MS) } });

function present(m: OutboxMail): LateMail {
  return {
    id: Number(m.id),
    to: m.toAddress,
    subject: m.subject,
    attempts: m.attempts,
    lastError: m.lastError,
    queuedAt: m.createdAt.toISOString(),
    nextAttemptAt: m.nextAttemptAt.toISOString(),
  };
}

/** Mail queued over an hour ago and still not delivered, oldest first. */
export async function listLateMail(query: { limit: number; offset: number }): Promise<LateMailList> {
  const { rows, count } = await OutboxMail.findAndCountAll({
    where: lateWhere(),
    order: [['id', 'ASC']],
    limit: query.limit,
    offset: query.offset,
  });
  return { items: rows.map(present), total: count };
}

/** Puts a mail that has not gone out at the front of the queue (its Message-ID stays the same). */
export async function resendMail(id: number): Promise<LateMail> {
  const mail = await OutboxMail.findByPk(id);
  if (!mail) throw new AppError(404, 'not_found', 'That mail was not found.');
  if (mail.status === 'sent') throw new AppError(409, 'mail_already_sent', 'This mail was delivered in the meantime.');
  await mail.update({ status: 'pending', nextAttemptAt: new Date() });
  return present(mail);
}

/**
 * Tells every active admin, in the app (mail may be what is broken), once per late mail:
 * after each outbox pass, mail that became late since the last pass is counted in one notice.
 */
export async function warnAdminsOfLateMail(deps: AppDeps) {
  await deps.sequelize.transaction(async (transaction) => {
    const late = await OutboxMail.findAll({
      where: { ...lateWhere(), warnedAt: null },
      attributes: ['id'],
      limit: 1000,
      lock: transaction.LOCK.UPDATE,
      skipLocked: true,
      transaction,
    });
    if (late.length === 0) return;
    await OutboxMail.update({ warnedAt: new Date() }, { where: { id: late.map((m) => m.id) }, transaction });
    const admins = await activeAdmins(transaction);
    const n = late.length;
    await createNotices(
      deps,
      admins.map((a) => a.id),
      {
        kind: 'mail.late',
        title: `${n} e-mail${n === 1 ? ' has' : 's have'} not been delivered for over an hour`,
        body: 'Faultline keeps trying. Check the mail server settings; the admin mail page lists what is waiting and can send it again now.',
        link: '/admin/mail',
      },
      transaction,
    );
  });
}
