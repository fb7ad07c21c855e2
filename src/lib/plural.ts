/** "1 lot", "7 lots". */
export const counted = (n: number, noun: string, plural = `${noun}s`) => `${n} ${n === 1 ? noun : plural}`;
