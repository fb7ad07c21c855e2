/** SQL for the number of pieces of a part now in stock bins; `partId` is an SQL expression. */
export const onHandSql = (partId: string) =>
  `(SELECT count(*) FROM pieces pc JOIN piece_locations pl ON pl.piece_id = pc.id JOIN locations loc ON loc.id = pl.location_id
     WHERE pc.part_id = ${partId} AND loc.kind = 'stock')`;
