export { Badge, type BadgeTone } from "./badge";
export { Button, buttonClasses, type ButtonProps, type ButtonVariant } from "./button";
export { Card, CardHeader } from "./card";
export { cn } from "./cn";
export { EmptyState } from "./empty-state";
export { Field, fieldAria } from "./field";
export { Input, Select, controlClasses } from "./input";
export { Notice, type NoticeTone } from "./notice";
export { Table, Td, Th } from "./table";
