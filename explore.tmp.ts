import { defaultScenario, runLoopGain } from "@/lib/design";
const s = defaultScenario("sink-npn");
s.opamp = { ...s.opamp, Rout: 0, fp2: null, slewRate: null, swingHigh: null, swingLow: null, Iout: null };
s.pass.VA = null;
const lg = runLoopGain(s, {}, { fStart: 0.01, fStop: 1, pointsPerDecade: 5 });
console.log(Math.hypot(lg.re[0], lg.im[0]), Math.hypot(lg.loops.local!.re[0], lg.loops.local!.im[0]), lg.re[0], lg.im[0]);
console.log(s.parts, s.opamp.Aol);
