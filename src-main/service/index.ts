export { createService, type Service, type ServiceImplementation } from './create-service.js';
export type { ServiceOptions } from './options.js';
