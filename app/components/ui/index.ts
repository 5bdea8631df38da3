export { Badge } from "./badge";
export { Button, ButtonLink, buttonClasses } from "./button";
export { Card } from "./card";
export { CardBody, CardHeader } from "./card-sections";
export { cx } from "./cx";
export { Dialog, DialogClose } from "./dialog";
export { CheckboxField, FieldFrame, SelectField, TextAreaField, TextField } from "./field";
export { Table, Td, Th, Tr } from "./table";
export { ToastProvider, useToast } from "./toast";
