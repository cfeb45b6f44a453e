import { DesignComment, User } from '@/db/models';
import { db } from '@/db';
import { getDesign } from './planner-designs';

export type CommentDto = { id: number; designId: number; author: { id: number; name: string } | null; text: string; createdAt: string };

function commentJson(row: DesignComment): CommentDto {
  const author = (row as unknown as { author?: User | null }).author;
  return { id: row.id, designId: row.designId, author: author ? { id: author.id, name: author.name } : null, text: row.text, createdAt: row.createdAt.toISOString() };
}

/** Comments on one design of the study, oldest first (404 when the design is not in the study). */
export async function listComments(studyId: number, designId: number): Promise<CommentDto[]> {
  await getDesign(studyId, designId);
  db();
  const rows = await DesignComment.findAll({
    where: { designId },
    include: [{ model: User, as: 'author', attributes: ['id', 'name'] }],
    order: [['createdAt', 'ASC'], ['id', 'ASC']],
  });
  return rows.map(commentJson);
}

/** Adds a comment by any member of the study. */
export async function addComment(authorId: number, studyId: number, designId: number, text: string): Promise<CommentDto> {
  await getDesign(studyId, designId);
  const row = await DesignComment.create({ designId, authorId, text });
  const withAuthor = await DesignComment.findByPk(row.id, { include: [{ model: User, as: 'author', attributes: ['id', 'name'] }] });
  return commentJson(withAuthor!);
}
