// Rimebook's pure computations, shared by the phone and the server.
export * from "./dates";
export * from "./units";
export * from "./protocols";
export * from "./schedule";
export * from "./round";
export * from "./sow-queue";
export * from "./cold-exposure";
export * from "./effective-window";
export * from "./planning";
export * from "./germination";
export * from "./statistics";
export * from "./bag-codes";
export * from "./cautions";
export * from "./starter-protocols";
export * from "./check-choice";
export * from "./survival";
export * from "./farm-history";
