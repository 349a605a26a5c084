export { FormCheckbox, FormChoice, FormMultiChoice, FormNumberField, FormTextField } from './fields';
