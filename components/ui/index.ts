export { Button } from './Button';
export { Card } from './Card';
export { Choice } from './Choice';
export { Field } from './Field';
export { Notice } from './Notice';
export { ProgressBar } from './ProgressBar';
export { Screen } from './Screen';
export { ValueRow } from './ValueRow';
export { Num, T } from './Text';
