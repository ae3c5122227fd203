export * from "./core";
export * from "./auth";
export * from "./bank";
export * from "./exams";
export * from "./checkoffs";
export * from "./compliance";
export * from "./audit";
export * from "./calendar";
