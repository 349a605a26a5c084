import { useWindowDimensions } from 'react-native';
import { breakpoints } from '../components/theme';

/** Phone first; from 1024 px the app adds a side navigation and multi-column layouts. */
export function useLayout(): { wide: boolean; width: number } {
  const { width } = useWindowDimensions();
  return { wide: width >= breakpoints.wide, width };
}
