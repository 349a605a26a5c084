import React from 'react';
import { SignInScreen } from '../components/screens/SignInScreen';
import { useDocumentTitle } from '../hooks/useDocumentTitle';

export default function SignInRoute() {
  useDocumentTitle('Sign in');
  return <SignInScreen />;
}
