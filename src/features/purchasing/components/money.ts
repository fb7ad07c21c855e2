/** An amount in the PO's currency, in the reader's number format. */
export const money = (value: number, currency: string) => value.toLocaleString(undefined, { style: 'currency', currency });
