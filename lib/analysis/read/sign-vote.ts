/**
 * Which sign of the current charges the cell. With a mode column, the words
 * decide. Otherwise the voltage response does: the terminal voltage rises while
 * charging (OCV rises with state of charge and the IR drop adds to it) and falls
 * while discharging (common practice, no source). So the products i·dv and
 * di·dv are positive on the whole when positive current charges.
 *
 * The evidence is judged as a z-score against sign noise: the sum of the
 * products over the square root of their sum of squares.
 */
import type { currentSigns } from "../types";

type CurrentSign = (typeof currentSigns)[number];

export interface SignVerdict {
  sign: CurrentSign;
  confidence: number;
}

const modeVotesNeeded = 20;
const decisiveZ = 5;
const clearZ = 2;

export class SignVote {
  private sum = 0;
  private squares = 0;
  private modeAgree = 0;
  private modeVotes = 0;
  private hasPrevious = false;
  private previousV = 0;
  private previousI = 0;

  add(v: number, i: number, direction: number): void {
    if (direction === 1 || direction === -1) {
      if (i !== 0) {
        this.modeVotes++;
        if (Math.sign(i) === direction) this.modeAgree++;
      }
    }
    if (this.hasPrevious) {
      const dv = v - this.previousV;
      const a = this.previousI * dv;
      const b = (i - this.previousI) * dv;
      this.sum += a + b;
      this.squares += a * a + b * b;
    }
    this.hasPrevious = true;
    this.previousV = v;
    this.previousI = i;
  }

  private z(): number {
    return this.squares > 0 ? this.sum / Math.sqrt(this.squares) : 0;
  }

  /** A verdict once the evidence is decisive, else null (keep buffering). */
  early(): SignVerdict | null {
    if (this.modeVotes >= modeVotesNeeded) return this.fromModes();
    const z = this.z();
    if (Math.abs(z) >= decisiveZ) return { sign: z > 0 ? "positive-charges" : "negative-charges", confidence: 0.95 };
    return null;
  }

  /** The best verdict on what was seen (end of file or of the buffer). */
  final(): SignVerdict {
    if (this.modeVotes > 0) return this.fromModes();
    const z = this.z();
    const sign: CurrentSign = z >= 0 ? "positive-charges" : "negative-charges";
    const size = Math.abs(z);
    const confidence = size >= decisiveZ ? 0.95 : size >= clearZ ? 0.85 : size > 0 ? 0.5 : 0.3;
    return { sign, confidence };
  }

  private fromModes(): SignVerdict {
    const agreeShare = this.modeAgree / this.modeVotes;
    const positive = agreeShare >= 0.5;
    const share = positive ? agreeShare : 1 - agreeShare;
    return { sign: positive ? "positive-charges" : "negative-charges", confidence: share >= 0.9 ? 0.95 : 0.6 };
  }
}
