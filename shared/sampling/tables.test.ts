// Every plan Phaselot offers — code letters A to R, AQL 0.065 to 10, normal, tightened and reduced
// inspection, arrows followed — against the single sampling tables of MIL-STD-105E / ANSI/ASQ Z1.4
// as encoded in the AQLSchemes R package (CRAN, version 1.7-2, file R/AAZ14Single.R), which stores
// each cell with its arrow already resolved into n, Ac and Re. Tightened plans are the same in
// ISO 2859-1 and Z1.4; reduced plans are Z1.4's, with the gap between Ac and Re.
import { describe, expect, it } from 'vitest';
import { probabilityOfAcceptance } from './oc';
import { codeLetterFor, planFor, resolveCell } from './plan';
import {
  AQL_VALUES,
  CODE_LETTERS,
  INSPECTION_LEVELS,
  LOT_SIZE_ROWS,
  PLAN_TABLES,
  SAMPLE_SIZES,
  SEVERITIES,
  parseCell,
  type Severity,
} from './tables';

// R's c() and rep(), so that the vectors below read as in the source.
const c = <T,>(...parts: (T | readonly T[])[]): T[] => parts.flat() as T[];
const rep = <T,>(value: T, times: number): T[] => Array<T>(times).fill(value);
// The source's sample-size tables are t(array(values, dim = c(26, 16))): one row of 26 AQLs per code letter.
const byRow = (values: number[]) => Array.from({ length: 16 }, (_, row) => values.slice(row * 26, row * 26 + 26));

// ---- Copied from AQLSchemes 1.7-2, R/AAZ14Single.R (R's `<-` written `=`). ----
const codes = c("A","B","C","D","E","F","G","H","J","K","L","M","N","P","Q","R");
const InspLev = c("S-1","S-2","S-3","S-4","I","II","III");
const LotSize = c("2-8","9-15","16-25","26-50","51-90","91-150","151-280","281-500","501-1200","1201-3200","3201-10,000","10,001-35,000","35,001-150,000","150,001-500,000","over 500,001");
const AQL = c("0.010","0.015","0.025","0.040","0.065","0.10","0.15","0.25","0.40","0.65","1.0","1.5","2.5","4.0","6.5","10","15","25","40","65","100","150","250","400","650","1000");

const letters = c("A","A","A","A","A","A","B",
  "A","A","A","A","A","B","C",
  "A","A","B","B","B","C","D",
  "A","B","B","C","C","D","E",
  "B","B","C","C","C","E","F",
  "B","B","C","D","D","F","G",
  "B","C","D","E","E","G","H",
  "B","C","D","E","F","H","J",
  "C","C","E","F","G","J","K",
  "C","D","E","G","H","K","L",
  "C","D","F","G","J","L","M",
  "C","D","F","H","K","M","N",
  "D","E","G","J","L","N","P",
  "D","E","G","J","M","P","Q",
  "D","E","H","K","N","Q","R");

const normalSampleSizes = byRow(c(1250,800,500,315,200,125,80,50,32,20,13,8,5,3,2,5,3,2,2,2,2,2,2,2,2,2,
  1250,800,500,315,200,125,80,50,32,20,13,8,5,3,2,5,3,3,3,3,3,3,3,3,3,3,
  1250,800,500,315,200,125,80,50,32,20,13,8,5,3,8,5,5,5,5,5,5,5,5,5,5,3,
  1250,800,500,315,200,125,80,50,32,20,13,8,5,13,8,8,8,8,8,8,8,8,8,8,5,3,
  1250,800,500,315,200,125,80,50,32,20,13,8,20,13,13,13,13,13,13,13,13,13,13,8,5,3,
  1250,800,500,315,200,125,80,50,32,20,13,32,20,20,20,20,20,20,20,20,13,13,13,8,5,3,
  1250,800,500,315,200,125,80,50,32,20,50,32,32,32,32,32,32,32,32,20,13,13,13,8,5,3,
  1250,800,500,315,200,125,80,50,32,80,50,50,50,50,50,50,50,50,32,20,13,13,13,8,5,3,
  1250,800,500,315,200,125,80,50,125,80,80,80,80,80,80,80,80,50,32,20,13,13,13,8,5,3,
  1250,800,500,315,200,125,80,200,125,125,125,125,125,125,125,125,80,50,32,20,13,13,13,8,5,3,
  1250,800,500,315,200,125,315,200,200,200,200,200,200,200,200,125,80,50,32,20,13,13,13,8,5,3,
  1250,800,500,315,200,500,315,315,315,315,315,315,315,315,200,125,80,50,32,20,13,13,13,8,5,3,
  1250,800,500,315,800,500,500,500,500,500,500,500,500,315,200,125,80,50,32,20,13,13,13,8,5,3,
  1250,800,500,1250,800,800,800,800,800,800,800,800,500,315,200,125,80,50,32,20,13,13,13,8,5,3,
  1250,800,2000,1250,1250,1250,1250,1250,1250,1250,1250,800,500,315,200,125,80,50,32,20,13,13,13,8,5,3,
  1250,800,2000,2000,2000,2000,2000,2000,2000,2000,1250,800,500,315,200,125,80,50,32,20,13,13,13,8,5,3));

const tightenedSampleSizes = byRow(c(2000,1250,800,500,315,200,125,80,50,32,20,13,8,5,3,8,5,3,2,2,2,2,2,2,2,2,
  2000,1250,800,500,315,200,125,80,50,32,20,13,8,5,3,8,5,3,3,3,3,3,3,3,3,3,
  2000,1250,800,500,315,200,125,80,50,32,20,13,8,5,13,8,5,5,5,5,5,5,5,5,5,3,
  2000,1250,800,500,315,200,125,80,50,32,20,13,8,20,13,8,8,8,8,8,8,8,8,8,5,3,
  2000,1250,800,500,315,200,125,80,50,32,20,13,32,20,13,13,13,13,13,13,13,13,13,8,5,3,
  2000,1250,800,500,315,200,125,80,50,32,20,50,32,20,20,20,20,20,20,20,13,13,13,8,5,3,
  2000,1250,800,500,315,200,125,80,50,32,80,50,32,32,32,32,32,32,32,20,13,13,13,8,5,3,
  2000,1250,800,500,315,200,125,80,50,125,80,50,50,50,50,50,50,50,32,20,13,13,13,8,5,3,
  2000,1250,800,500,315,200,125,80,200,125,80,80,80,80,80,80,80,50,32,20,13,13,13,8,5,3,
  2000,1250,800,500,315,200,125,315,200,125,125,125,125,125,125,125,80,50,32,20,13,13,13,8,5,3,
  2000,1250,800,500,315,200,500,315,200,200,200,200,200,200,200,125,80,50,32,20,13,13,13,8,5,3,
  2000,1250,800,500,315,800,500,315,315,315,315,315,315,315,200,125,80,50,32,20,13,13,13,8,5,3,
  2000,1250,800,500,1250,800,500,500,500,500,500,500,500,315,200,125,80,50,32,20,13,13,13,8,5,3,
  2000,1250,800,2000,1250,800,800,800,800,800,800,800,500,315,200,125,80,50,32,20,13,13,13,8,5,3,
  2000,1250,3150,2000,1250,1250,1250,1250,1250,1250,1250,800,500,315,200,125,80,50,32,20,13,13,13,8,5,3,
  2000,1250,3150,2000,2000,2000,2000,2000,2000,2000,1250,800,500,315,200,125,80,50,32,20,13,13,13,8,5,3));

const reducedSampleSizes = byRow(c(500,315,200,125,80,50,32,20,13,8,5,3,2,2,2,2,2,2,2,2,2,2,2,2,2,2,
  500,315,200,125,80,50,32,20,13,8,5,3,2,2,2,2,2,2,2,2,2,2,2,2,2,2,
  500,315,200,125,80,50,32,20,13,8,5,3,2,2,3,2,2,2,2,2,2,2,2,2,2,2,
  500,315,200,125,80,50,32,20,13,8,5,3,2,5,3,3,3,3,3,3,3,3,3,3,2,2,
  500,315,200,125,80,50,32,20,13,8,5,3,8,5,5,5,5,5,5,5,5,5,5,3,2,2,
  500,315,200,125,80,50,32,20,13,8,5,13,8,8,8,8,8,8,8,8,5,5,5,3,2,2,
  500,315,200,125,80,50,32,20,13,8,20,13,13,13,13,13,13,13,13,8,5,5,5,3,2,2,
  500,315,200,125,80,50,32,20,13,32,20,20,20,20,20,20,20,20,13,8,5,5,5,3,2,2,
  500,315,200,125,80,50,32,20,50,32,32,32,32,32,32,32,32,20,13,8,5,5,5,3,2,2,
  500,315,200,125,80,50,32,80,50,50,50,50,50,50,50,50,32,20,13,8,5,5,5,3,2,2,
  500,315,200,125,80,50,125,80,80,80,80,80,80,80,80,50,32,20,13,8,5,5,5,3,2,2,
  500,315,200,125,80,200,125,125,125,125,125,125,125,125,80,50,32,20,13,8,5,5,5,3,2,2,
  500,315,200,125,315,200,200,200,200,200,200,200,200,125,80,50,32,20,13,8,5,5,5,3,2,2,
  500,315,200,500,315,315,315,315,315,315,315,315,200,125,80,50,32,20,13,8,5,5,5,3,2,2,
  500,315,800,500,500,500,500,500,500,500,500,315,200,125,80,50,32,20,13,8,5,5,5,3,2,2,
  500,315,800,800,800,800,800,800,800,800,500,315,200,125,80,50,32,20,13,8,5,5,5,3,2,2));

const normalAc = (() => {
  const c1 = rep(0,16);
  const c2 = c1;
  const c3 = c(rep(0,14),1,1);
  const c4 = c(rep(0,13),1,1,2);
  const c5 = c(rep(0,12),1,1,2,3);
  const c6 = c(rep(0,11),1,1,2,3,5);
  const c7 = c(rep(0,10),1,1,2,3,5,7);
  const c8 = c(rep(0,9),1,1,2,3,5,7,10);
  const c9 = c(rep(0,8),1,1,2,3,5,7,10,14);
  const c10 = c(rep(0,7),1,1,2,3,5,7,10,14,21);
  const c11 = c(rep(0,6),1,1,2,3,5,7,10,14,21,21);
  const c12 = c(rep(0,5),1,1,2,3,5,7,10,14,21,21,21);
  const c13 = c(rep(0,4),1,1,2,3,5,7,10,14,21,21,21,21);
  const c14 = c(rep(0,3),1,1,2,3,5,7,10,14,rep(21,5));
  const c15 = c(0,0,1,1,2,3,5,7,10,14,21,rep(21,5));
  const c16 = c(1,1,1,2,3,5,7,10,14,21,rep(21,6));
  const c17 = c(1,1,2,3,5,7,10,14,21,rep(21,7));
  const c18 = c(1,2,3,5,7,10,14,21,rep(21,8));
  const c19 = c(2,3,5,7,10,14,21,rep(21,9));
  const c20 = c(3,5,7,10,14,21,rep(21,10));
  const c21 = c(5,7,10,14,21,rep(21,11));
  const c22 = c(7,10,14,21,30,rep(30,11));
  const c23 = c(10,14,21,30,44,rep(44,11));
  const c24 = c(14,21,30,44,rep(44,12));
  const c25 = c(21,30,44,rep(44,13));
  const c26 = c(30,44,rep(44,14));
  return [c1, c2, c3, c4, c5, c6, c7, c8, c9, c10, c11, c12, c13, c14, c15, c16, c17, c18, c19, c20, c21, c22, c23, c24, c25, c26];
})();

const normalRe = (() => {
  const c1 = rep(1,16);
  const c2 = c1;
  const c3 = c(rep(1,14),2,2);
  const c4 = c(rep(1,13),2,2,3);
  const c5 = c(rep(1,12),2,2,3,4);
  const c6 = c(rep(1,11),2,2,3,4,6);
  const c7 = c(rep(1,10),2,2,3,4,6,8);
  const c8 = c(rep(1,9),2,2,3,4,6,8,11);
  const c9 = c(rep(1,8),2,2,3,4,6,8,11,15);
  const c10 = c(rep(1,7),2,2,3,4,6,8,11,15,22);
  const c11 = c(rep(1,6),2,2,3,4,6,8,11,15,22,22);
  const c12 = c(rep(1,5),2,2,3,4,6,8,11,15,22,22,22);
  const c13 = c(rep(1,4),2,2,3,4,6,8,11,15,22,22,22,22);
  const c14 = c(rep(1,3),2,2,3,4,6,8,11,15,rep(22,5));
  const c15 = c(1,1,2,2,3,4,6,8,11,15,22,rep(22,5));
  const c16 = c(2,2,2,3,4,6,8,11,15,22,rep(22,6));
  const c17 = c(2,2,3,4,6,8,11,15,22,rep(22,7));
  const c18 = c(2,3,4,6,8,11,15,22,rep(22,8));
  const c19 = c(3,4,6,8,11,15,22,rep(22,9));
  const c20 = c(4,6,8,11,15,22,rep(22,10));
  const c21 = c(6,8,11,15,22,rep(22,11));
  const c22 = c(8,11,15,22,31,rep(31,11));
  const c23 = c(11,15,22,31,45,rep(45,11));
  const c24 = c(15,22,31,45,rep(45,12));
  const c25 = c(22,31,45,rep(45,13));
  const c26 = c(31,45,rep(45,14));
  return [c1, c2, c3, c4, c5, c6, c7, c8, c9, c10, c11, c12, c13, c14, c15, c16, c17, c18, c19, c20, c21, c22, c23, c24, c25, c26];
})();

const tightenedAc = (() => {
  const c1 = rep(0,16);
  const c2 = c1;
  const c3 = c(rep(0,14),1,1);
  const c4 = c(rep(0,13),1,1,1);
  const c5 = c(rep(0,12),1,1,1,2);
  const c6 = c(rep(0,11),1,1,1,2,3);
  const c7 = c(rep(0,10),1,1,1,2,3,5);
  const c8 = c(rep(0,9),1,1,1,2,3,5,8);
  const c9 = c(rep(0,8),1,1,1,2,3,5,8,12);
  const c10 = c(rep(0,7),1,1,1,2,3,5,8,12,18);
  const c11 = c(rep(0,6),1,1,1,2,3,5,8,12,18,18);
  const c12 = c(rep(0,5),1,1,1,2,3,5,8,12,18,18,18);
  const c13 = c(rep(0,4),1,1,1,2,3,5,8,12,18,18,18,18);
  const c14 = c(rep(0,3),1,1,1,2,3,5,8,12,rep(18,5));
  const c15 = c(0,0,1,1,1,2,3,5,8,12,18,rep(18,5));
  const c16 = c(1,1,1,1,2,3,5,8,12,18,rep(18,6));
  const c17 = c(1,1,1,2,3,5,8,12,18,rep(18,7));
  const c18 = c(1,1,2,3,5,8,12,18,rep(18,8));
  const c19 = c(1,2,3,5,8,12,18,rep(18,9));
  const c20 = c(2,3,5,8,12,18,rep(18,10));
  const c21 = c(3,5,8,12,18,rep(18,11));
  const c22 = c(5,8,12,18,27,rep(27,11));
  const c23 = c(8,12,18,27,41,rep(41,11));
  const c24 = c(12,18,27,41,rep(41,12));
  const c25 = c(18,27,41,rep(41,13));
  const c26 = c(27,41,rep(41,14));
  return [c1, c2, c3, c4, c5, c6, c7, c8, c9, c10, c11, c12, c13, c14, c15, c16, c17, c18, c19, c20, c21, c22, c23, c24, c25, c26];
})();

const tightenedRe = (() => {
  const c1 = rep(1,16);
  const c2 = c1;
  const c3 = c(rep(1,14),2,2);
  const c4 = c(rep(1,13),2,2,2);
  const c5 = c(rep(1,12),2,2,2,3);
  const c6 = c(rep(1,11),2,2,2,3,4);
  const c7 = c(rep(1,10),2,2,2,3,4,6);
  const c8 = c(rep(1,9),2,2,2,3,4,6,9);
  const c9 = c(rep(1,8),2,2,2,3,4,6,9,13);
  const c10 = c(rep(1,7),2,2,2,3,4,6,9,13,19);
  const c11 = c(rep(1,6),2,2,2,3,4,6,9,13,19,19);
  const c12 = c(rep(1,5),2,2,2,3,4,6,9,13,19,19,19);
  const c13 = c(rep(1,4),2,2,2,3,4,6,9,13,19,19,19,19);
  const c14 = c(rep(1,3),2,2,2,3,4,6,9,13,rep(19,5));
  const c15 = c(1,1,2,2,2,3,4,6,9,13,19,rep(19,5));
  const c16 = c(2,2,2,2,3,4,6,9,13,19,rep(19,6));
  const c17 = c(2,2,2,3,4,6,9,13,19,rep(19,7));
  const c18 = c(2,2,3,4,6,9,13,19,rep(19,8));
  const c19 = c(2,3,4,6,9,13,19,rep(19,9));
  const c20 = c(3,4,6,9,13,19,rep(19,10));
  const c21 = c(4,6,9,13,19,rep(19,11));
  const c22 = c(6,9,13,19,28,rep(28,11));
  const c23 = c(9,13,19,28,42,rep(42,11));
  const c24 = c(13,19,28,42,rep(42,12));
  const c25 = c(19,28,42,rep(42,13));
  const c26 = c(28,42,rep(42,14));
  return [c1, c2, c3, c4, c5, c6, c7, c8, c9, c10, c11, c12, c13, c14, c15, c16, c17, c18, c19, c20, c21, c22, c23, c24, c25, c26];
})();

const reducedAc = (() => {
  const c1 = rep(0,16);
  const c2 = c1;
  const c3 = c(rep(0,16));
  const c4 = c(rep(0,15),1);
  const c5 = c(rep(0,14),1,1);
  const c6 = c(rep(0,13),1,1,2);
  const c7 = c(rep(0,12),1,1,2,3);
  const c8 = c(rep(0,11),1,1,2,3,5);
  const c9 = c(rep(0,10),1,1,2,3,5,7);
  const c10 = c(rep(0,9),1,1,2,3,5,7,10);
  const c11 = c(rep(0,8),1,1,2,3,5,7,10,10);
  const c12 = c(rep(0,7),1,1,2,3,5,7,10,10,10);
  const c13 = c(rep(0,6),1,1,2,3,5,7,10,10,10,10);
  const c14 = c(rep(0,5),1,1,2,3,5,7,10,rep(10,4));
  const c15 = c(0,0,0,0,1,1,2,3,5,7,10,rep(10,5));
  const c16 = c(0,0,0,1,1,2,3,5,7,10,rep(10,6));
  const c17 = c(0,0,1,1,2,3,5,7,10,rep(10,7));
  const c18 = c(1,1,1,2,3,5,7,10,rep(10,8));
  const c19 = c(2,2,2,3,5,7,10,rep(10,9));
  const c20 = c(3,3,3,5,7,10,rep(10,10));
  const c21 = c(5,5,5,7,10,rep(10,11));
  const c22 = c(7,7,7,10,14,rep(14,11));
  const c23 = c(10,10,10,14,21,rep(21,11));
  const c24 = c(14,14,14,21,rep(21,12));
  const c25 = c(21,21,21,rep(21,13));
  const c26 = c(rep(30,16));
  return [c1, c2, c3, c4, c5, c6, c7, c8, c9, c10, c11, c12, c13, c14, c15, c16, c17, c18, c19, c20, c21, c22, c23, c24, c25, c26];
})();

const reducedRe = (() => {
  const c1 = rep(1,16);
  const c2 = c1;
  const c3 = c(rep(1,14),2,2);
  const c4 = c(rep(1,13),2,2,3);
  const c5 = c(rep(1,12),2,2,3,4);
  const c6 = c(rep(1,11),2,2,3,4,5);
  const c7 = c(rep(1,10),2,2,3,4,5,6);
  const c8 = c(rep(1,9),2,2,3,4,5,6,8);
  const c9 = c(rep(1,8),2,2,3,4,5,6,8,10);
  const c10 = c(rep(1,7),2,2,3,4,5,6,8,10,13);
  const c11 = c(rep(1,6),2,2,3,4,5,6,8,10,13,13);
  const c12 = c(rep(1,5),2,2,3,4,5,6,8,10,13,13,13);
  const c13 = c(rep(1,4),2,2,3,4,5,6,8,10,13,13,13,13);
  const c14 = c(rep(1,3),2,2,3,4,5,6,8,10,13,rep(13,4));
  const c15 = c(1,1,2,2,3,4,5,6,8,10,13,rep(13,5));
  const c16 = c(2,2,2,3,4,5,6,8,10,13,rep(13,6));
  const c17 = c(2,2,3,4,5,6,8,10,13,rep(13,7));
  const c18 = c(2,3,4,5,6,8,10,13,rep(13,8));
  const c19 = c(3,4,5,6,8,10,13,rep(13,9));
  const c20 = c(4,5,6,8,10,13,rep(13,10));
  const c21 = c(6,6,8,10,13,rep(13,11));
  const c22 = c(8,8,10,13,17,rep(17,11));
  const c23 = c(11,11,13,17,24,rep(24,11));
  const c24 = c(15,15,17,24,rep(24,12));
  const c25 = c(22,22,24,rep(24,13));
  const c26 = c(rep(31,16));
  return [c1, c2, c3, c4, c5, c6, c7, c8, c9, c10, c11, c12, c13, c14, c15, c16, c17, c18, c19, c20, c21, c22, c23, c24, c25, c26];
})();

// ---- End of the copy. ----

// Rows of the source: one per code letter; columns of the c1…c26 vectors: one per AQL.
const SOURCE: Record<Severity, { sampleSizes: number[][]; ac: number[][]; re: number[][] }> = {
  normal: { sampleSizes: normalSampleSizes, ac: normalAc, re: normalRe },
  tightened: { sampleSizes: tightenedSampleSizes, ac: tightenedAc, re: tightenedRe },
  reduced: { sampleSizes: reducedSampleSizes, ac: reducedAc, re: reducedRe },
};

function publishedPlan(severity: Severity, letter: string, aql: number) {
  const row = codes.indexOf(letter);
  const column = AQL.findIndex((label) => Number(label) === aql);
  const { sampleSizes, ac, re } = SOURCE[severity];
  return { sampleSize: sampleSizes[row][column], accept: ac[column][row], reject: re[column][row] };
}

function lotSizeRange(label: string) {
  const [min, max] = label.replace('over ', '').replaceAll(',', '').split('-').map(Number);
  return { min, max: max ?? Number.POSITIVE_INFINITY };
}

describe('the copied source', () => {
  it('has the shape of the published tables and covers the AQLs offered', () => {
    expect(codes).toEqual([...CODE_LETTERS]);
    expect(InspLev).toEqual([...INSPECTION_LEVELS]);
    for (const aql of AQL_VALUES) expect(AQL.some((label) => Number(label) === aql), String(aql)).toBe(true);
    for (const { sampleSizes, ac, re } of Object.values(SOURCE)) {
      expect(sampleSizes.flat()).toHaveLength(16 * 26);
      expect(ac.map((column) => column.length)).toEqual(rep(16, 26));
      expect(re.map((column) => column.length)).toEqual(rep(16, 26));
    }
  });
});

describe('Table 1, sample size code letters', () => {
  it.each(LotSize.map((label, row) => [label, row] as const))('lot sizes %s: the letter of every level at both ends of the row', (label, row) => {
    // The source's 15 × 7 matrix, filled by row: lot-size rows, levels S-1 … III.
    const { min, max } = lotSizeRange(label);
    INSPECTION_LEVELS.forEach((level, column) => {
      const published = letters[row * 7 + column];
      expect(codeLetterFor(min, level), `${min} at ${level}`).toBe(published);
      if (Number.isFinite(max)) expect(codeLetterFor(max, level), `${max} at ${level}`).toBe(published);
    });
    expect(LOT_SIZE_ROWS[row]).toEqual({ min, max, letters: letters.slice(row * 7, row * 7 + 7) });
  });
});

describe.each(SEVERITIES)('%s inspection, every cell', (severity) => {
  it.each([...CODE_LETTERS])('code letter %s: n, Ac and Re at every AQL, arrows followed', (letter) => {
    for (const aql of AQL_VALUES) {
      const reached = resolveCell(severity, letter, aql);
      const ours = { sampleSize: SAMPLE_SIZES[severity][reached.letterIndex], accept: reached.accept, reject: reached.reject };
      expect(ours, `${severity} ${letter} / AQL ${aql}`).toEqual(publishedPlan(severity, letter, aql));
    }
  });

  it('planFor gives the published plan for a lot at either end of every lot-size row, at every level and AQL', () => {
    LotSize.forEach((label, row) => {
      const { min, max } = lotSizeRange(label);
      for (const lotSize of Number.isFinite(max) ? [min, max] : [min]) {
        INSPECTION_LEVELS.forEach((level, column) => {
          const codeLetter = letters[row * 7 + column];
          for (const aql of AQL_VALUES) {
            const published = publishedPlan(severity, codeLetter, aql);
            const plan = planFor({ lotSize, level, aql, severity });
            // The source's own note: if the sample size exceeds the lot size, inspect every piece.
            expect(
              { codeLetter: plan.codeLetter, sampleSize: plan.sampleSize, accept: plan.accept, reject: plan.reject, hundredPercent: plan.hundredPercent },
              `${lotSize} at ${level}, AQL ${aql}`,
            ).toEqual({ codeLetter, ...published, hundredPercent: published.sampleSize >= lotSize });
            expect(SAMPLE_SIZES[severity][CODE_LETTERS.indexOf(plan.planLetter)]).toBe(published.sampleSize);
          }
        });
      }
    });
  });
});

// Structure of the tables (common practice), which the resolved source cannot show: where the
// arrows point. It settles the plan letter where several letters share one sample size (reduced
// A to C, n = 2).
const cellAt = (severity: Severity, row: number, column: number) => PLAN_TABLES[severity][CODE_LETTERS[row]][column];

describe.each(SEVERITIES)('arrows of the %s table', (severity) => {
  it('are constant along each diagonal (one code letter down = one AQL step tighter)', () => {
    const breaks: string[] = [];
    for (let row = 0; row + 1 < CODE_LETTERS.length; row++) {
      for (let column = 1; column < AQL_VALUES.length; column++) {
        if (cellAt(severity, row + 1, column - 1) !== cellAt(severity, row, column)) breaks.push(`${CODE_LETTERS[row]} / ${AQL_VALUES[column]}`);
      }
    }
    // Tightened A at AQL 10 has no 0/1 plan where the diagonal would put one: the source above
    // resolves it to D, n = 8, Ac 1 (and so does the Planesmuestra R package, Ac 1 at A / 10).
    expect(breaks).toEqual(severity === 'tightened' ? ['A / 10'] : []);
  });

  it('lead to a plan in their direction, but for code letter A at AQL 10 on normal and reduced inspection', () => {
    const deadEnds: string[] = [];
    for (let row = 0; row < CODE_LETTERS.length; row++) {
      for (let column = 0; column < AQL_VALUES.length; column++) {
        const cell = cellAt(severity, row, column);
        if (cell !== '↓' && cell !== '↑') continue;
        const step = cell === '↓' ? 1 : -1;
        let found = false;
        for (let other = row + step; other >= 0 && other < CODE_LETTERS.length && !found; other += step) {
          found = parseCell(cellAt(severity, other, column)) !== null;
        }
        if (!found) deadEnds.push(`${CODE_LETTERS[row]} / ${AQL_VALUES[column]}`);
      }
    }
    expect(deadEnds).toEqual(severity === 'tightened' ? [] : ['A / 10']);
  });
});

describe('tightened against normal', () => {
  it('accepts a lot at the AQL no more often than normal inspection, for every code letter and AQL', () => {
    // The purpose of tightened inspection (common practice), with the binomial model of oc.ts.
    for (const letter of CODE_LETTERS) {
      for (const aql of AQL_VALUES) {
        const normal = resolveCell('normal', letter, aql);
        const tightened = resolveCell('tightened', letter, aql);
        const paNormal = probabilityOfAcceptance(SAMPLE_SIZES.normal[normal.letterIndex], normal.accept, aql / 100);
        const paTightened = probabilityOfAcceptance(SAMPLE_SIZES.tightened[tightened.letterIndex], tightened.accept, aql / 100);
        expect(paTightened, `${letter} / ${aql}`).toBeLessThanOrEqual(paNormal + 1e-12);
      }
    }
  });
});
