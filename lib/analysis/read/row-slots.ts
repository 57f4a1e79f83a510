/**
 * Slots of one row in the Float64Arrays the parsing paths and the sink share.
 * Rows travel through typed arrays, not call arguments: V8 boxes doubles passed
 * to calls it does not inline, which would allocate several objects per row.
 */

/** What a parsing path writes for each row (RowSink.input). */
export const inTimeWhole = 0;
export const inTimeFrac = 1;
export const inVoltage = 2;
export const inCurrent = 3;
export const inTemperature = 4;
export const inStep = 5;
export const inCycle = 6;
/** +1 charge, -1 discharge, 0 rest; NaN when the mode cell is empty or there is no mode column. */
export const inDirection = 7;
export const inRecord = 8;
export const inputSlots = 9;

/** A converted row: seconds, volts, amperes (sign not yet applied while held), °C. */
export const rowT = 0;
export const rowV = 1;
export const rowI = 2;
export const rowTemp = 3;
export const rowStep = 4;
export const rowCycle = 5;
export const rowDirection = 6;
export const rowRecord = 7;
export const rowSlots = 8;
