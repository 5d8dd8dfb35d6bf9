// The robust verdict over several smooth-model families: a perturber is claimed only when it is
// needed under every smooth model that fits the data.
export { checkFamilies, compareFamilies, type FamilyComparison, type FamilyModel, type FamilySettings } from './compareFamilies.js';
export { familyComponents, type FamilyComponents } from './familyComponents.js';
export { familySuggestions } from './familySuggestions.js';
export { robustVerdict, VERDICT_LIMITS, VERDICT_RULE, type FamilyOutcome } from './robustVerdict.js';
export { familyFolder, runVerdictToFolder, type VerdictSettings } from './runVerdictToFolder.js';
