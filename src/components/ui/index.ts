export { GillwiseMark, Wordmark } from './brand';
export { Button, buttonClasses, type ButtonProps, type ButtonVariant } from './button';
export { Alert, Callout, type CalloutProps, type CalloutTone } from './callout';
export { cx } from './cx';
export { Dialog, Sheet, type DialogProps, type SheetProps } from './dialog';
export { EmptyState } from './empty-state';
export {
  NumberField,
  parseDecimal,
  Select,
  TextField,
  type NumberFieldProps,
  type SelectOption,
  type SelectProps,
  type TextFieldProps,
} from './field';
export { Icon, type IconName } from './icon';
export { FullPageSpinner, Spinner } from './spinner';
export { StatusBadge, statusStyle, unitStatuses, type UnitStatus } from './status-badge';
export { Table, type Column } from './table';
