import { channelRangeOutside, channelRangeReversed, cleanOverlapsExcluded, rangesOverlap, tooFewCleanChannels } from './channels';
import { delayWindowAmbiguous, delayWindowWide } from './delay-window';
import { applyMissingTarget, stepRoleMismatch, unknownField, unknownSpectralWindow } from './fields';
import { fluxModelExtrapolated, fluxModelImplausible, fluxModelWrongSource } from './flux-model';
import { gainIntervalSpansScans, intervalShorterThanIntegration } from './intervals';
import { duplicateStep, missingInput, stepOutOfOrder } from './order';
import { prepIntervalShorterThanScan, prepNoCleanChannels } from './prep';
import { referenceFallbackFlagged, referenceFallbackInvalid, referenceNotInCalibratorScans, referenceUnknown } from './reference';
import { duplicateField, noBandpassCalibrator, noFluxCalibrator, noFluxModel, targetAndCalibrator, targetWithoutGainCalibrator } from './roles';
import { gainCalibratorFar } from './separation';
import { snrArrayUnknown, snrBelowMinimum, snrFluxUnknown, snrInfeasible } from './snr';
import type { Rule } from './types';

/** Every validation rule, in the order their findings are listed. Codes are stable: policies refer to them. */
export const RULES: readonly Rule[] = [
	unknownSpectralWindow,
	unknownField,
	duplicateField,
	stepOutOfOrder,
	duplicateStep,
	missingInput,
	noFluxCalibrator,
	noFluxModel,
	noBandpassCalibrator,
	targetWithoutGainCalibrator,
	targetAndCalibrator,
	stepRoleMismatch,
	applyMissingTarget,
	gainCalibratorFar,
	referenceUnknown,
	referenceNotInCalibratorScans,
	referenceFallbackInvalid,
	referenceFallbackFlagged,
	channelRangeReversed,
	channelRangeOutside,
	cleanOverlapsExcluded,
	rangesOverlap,
	prepNoCleanChannels,
	prepIntervalShorterThanScan,
	tooFewCleanChannels,
	delayWindowAmbiguous,
	delayWindowWide,
	intervalShorterThanIntegration,
	gainIntervalSpansScans,
	snrBelowMinimum,
	snrInfeasible,
	snrFluxUnknown,
	snrArrayUnknown,
	fluxModelExtrapolated,
	fluxModelImplausible,
	fluxModelWrongSource
];
