export { Button } from './Button';
export { Card } from './Card';
export { Choice } from './Choice';
export { Field } from './Field';
export { Notice } from './Notice';
export { ProgressBar } from './ProgressBar';
export { Screen } from './Screen';
export { Num, T } from './Text';
