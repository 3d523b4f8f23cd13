export * from "./auth";
export * from "./campaigns";
export * from "./counts";
export * from "./analysis";
export * from "./alerts";
export * from "./decisions";
