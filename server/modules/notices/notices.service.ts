import { Op, type Transaction } from 'sequelize';
import { Notice } from './notice.model';
import { notFound } from '../../lib/errors';
import type { AppDeps } from '../../lib/http';
import type { NoticeItem, NoticePage } from '../../../shared/schemas/facility';
import { queuePush } from '../push/push.service';

export interface NewNotice {
  kind: string;
  title: string;
  body?: string | null;
  /** A path inside the app, e.g. /tools/ETCH-02. */
  link?: string | null;
  /** Also as a phone notification to the browsers these people allowed (web push). */
  push?: boolean;
  /** Sent with the 'notice.created' event, so open ticket pages know which ticket it is about. */
  ticketId?: number;
}

/**
 * In-app notices for several people at once, written in the caller's transaction; each
 * person's open pages hear 'notice.created' after the commit and refetch their list.
 */
export async function createNotices(deps: AppDeps, userIds: number[], notice: NewNotice, transaction?: Transaction | null) {
  const ids = [...new Set(userIds)];
  if (ids.length === 0) return;
  await Notice.bulkCreate(
    ids.map((userId) => ({
      userId,
      kind: notice.kind,
      title: notice.title.slice(0, 200),
      body: notice.body ?? null,
      link: notice.link ?? null,
      readAt: null,
    })),
    { transaction: transaction ?? undefined },
  );
  if (notice.push) await queuePush(ids, { title: notice.title, body: notice.body ?? '', link: notice.link ?? '/' }, transaction);
  deps.events.publish(
    {
      type: 'notice.created',
      audience: { users: ids },
      payload: { kind: notice.kind, ...(notice.ticketId ? { ticketId: notice.ticketId } : {}) },
    },
    transaction,
  );
}

function present(n: Notice): NoticeItem {
  return {
    id: Number(n.id),
    kind: n.kind,
    title: n.title,
    body: n.body,
    link: n.link,
    readAt: n.readAt?.toISOString() ?? null,
    createdAt: n.createdAt.toISOString(),
  };
}

export async function listNotices(userId: number, query: { unread?: boolean; limit: number; offset: number }): Promise<NoticePage> {
  const where = query.unread ? { userId, readAt: null } : { userId };
  const [{ rows, count }, unread] = await Promise.all([
    Notice.findAndCountAll({
      where,
      order: [
        ['createdAt', 'DESC'],
        ['id', 'DESC'],
      ],
      limit: query.limit,
      offset: query.offset,
    }),
    Notice.count({ where: { userId, readAt: null } }),
  ]);
  return { items: rows.map(present), total: count, unread, limit: query.limit, offset: query.offset };
}

export async function markNoticeRead(deps: AppDeps, userId: number, id: number) {
  const notice = await Notice.findOne({ where: { id, userId } });
  // Someone else's notice is "not found", never "forbidden": its existence is not theirs to learn.
  if (!notice) throw notFound('Notice');
  if (!notice.readAt) await notice.update({ readAt: new Date() });
  deps.events.publish({ type: 'notice.read', audience: { users: [userId] }, payload: { id } });
  return present(notice);
}

export async function markAllNoticesRead(deps: AppDeps, userId: number) {
  const [count] = await Notice.update({ readAt: new Date() }, { where: { userId, readAt: { [Op.is]: null } } });
  deps.events.publish({ type: 'notice.read', audience: { users: [userId] }, payload: { all: true } });
  return { marked: count };
}
