export * from "./common";
export * from "./arm";
export * from "./requirements";
export * from "./roles";
export * from "./cell";
export * from "./urdf";
export * from "./mounting";
