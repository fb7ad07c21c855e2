/** SQL for the number of pieces of a part now in stock bins; `partId` is an SQL expression. The
 * ledger keeps the counts per part and location (the view on_hand). */
export const onHandSql = (partId: string) =>
  `(SELECT coalesce(sum(oh.pieces), 0) FROM on_hand oh JOIN locations loc ON loc.id = oh.location_id
     WHERE oh.part_id = ${partId} AND loc.kind = 'stock')`;
