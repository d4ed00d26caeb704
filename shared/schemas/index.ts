export * from "./common";
export * from "./auth";
export * from "./workshops";
export * from "./trades";
export * from "./customers";
export * from "./jobs";
export * from "./health";
export * from "./mail";
