/** Phase balancing of single-phase customers (see balance.ts). */
export { parseCustomersCsv, customersFromRecords, customerRowSchema, CustomerListError, issueText, BALANCE_PHASES, MAX_CUSTOMERS, type Customer, type CustomerIssue, type BalancePhase } from './customers.ts';
export { analyseFeeder, checkCustomers, withCustomers, rotatingRule, currentAssignment, allowedPhases, type Assignment, type BalanceFeeder } from './feeder.ts';
export { exactFigures, neutralPoint, solveAssignment, type BalanceFigures, type CustomerVoltage, type NeutralPoint } from './figures.ts';
export { BALANCE_OBJECTIVES, score as balanceScore, singleScore, mixNormalisers, type BalanceObjective, type ObjectiveSpec, type UnbalanceDefinition, type SingleObjective } from './objectives.ts';
export { BalanceCancelled } from './linear-model.ts';
export { solveMilp, type HighsRuntime, type HighsModel, type MilpResult } from './milp.ts';
export { balancePhases, type BalanceOptions, type BalanceProgress, type BalanceMove, type BalanceResult } from './balance.ts';
export { movesCsv, MOVES_CAUTION, FIGURE_ROWS, objectiveWords } from './report.ts';
export { csvDelimiter, type CsvDelimiter } from './csv.ts';
export { customersFromCircuit, applyAssignment, applyCustomers } from './study-loads.ts';
