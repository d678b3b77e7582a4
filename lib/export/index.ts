/** Serializers of a shortlist's result (pure: no database, no HTTP). */
export * from "./tables";
export * from "./csv";
export * from "./xlsx";
export * from "./json";
export * from "./files";
export * from "./shortlist";
