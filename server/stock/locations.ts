import { Location } from '../../db/models';

/** Every location, grouped by kind. */
export const listLocations = () =>
  Location.findAll({
    order: [
      ['kind', 'ASC'],
      ['code', 'ASC'],
    ],
  });
export type LocationRecord = Awaited<ReturnType<typeof listLocations>>[number];
