export * from "./blueprint";
export * from "./draw";
export * from "./timing";
