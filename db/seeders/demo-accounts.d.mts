export declare const demoGroup: string;
export declare const demoAccounts: ReadonlyArray<{
  role: 'owner' | 'editor' | 'operator' | 'viewer';
  name: string;
  email: string;
  password: string;
}>;
