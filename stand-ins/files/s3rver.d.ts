// s3rver ships no types; this is the part of its programmatic API the stand-in uses.
declare module "s3rver" {
  type Options = {
    address?: string;
    port?: number;
    silent?: boolean;
    directory?: string;
    resetOnClose?: boolean;
    vhostBuckets?: boolean;
    configureBuckets?: Array<{ name: string; configs: Array<string | Buffer> }>;
  };
  export default class S3rver {
    constructor(options: Options);
    run(): Promise<{ address: string; port: number }>;
    close(): Promise<void>;
  }
}
