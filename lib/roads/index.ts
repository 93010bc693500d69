export * from "./aggregate"
export * from "./cells"
export * from "./clock"
export * from "./model"
