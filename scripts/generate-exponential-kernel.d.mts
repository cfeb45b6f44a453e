export declare const LAYOUT: Readonly<Record<string, number>>;
export declare const exponentialKernelText: string;
export declare function assembleExponentialKernel(): Promise<Uint8Array>;
export declare function kernelModuleText(bytes: Uint8Array): string;
