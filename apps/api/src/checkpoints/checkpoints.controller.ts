import { Body, Controller, Get, HttpCode, Param, Post } from '@nestjs/common';
import { Public } from '../identities/auth.guard';
import { CHECKPOINT_ALGORITHM, CheckpointsService } from './checkpoints.service';

@Controller('api/v1')
export class CheckpointsController {
  constructor(private readonly checkpoints: CheckpointsService) {}

  /** Signs the product's current chain head now. */
  @Post('products/:id/checkpoints')
  @HttpCode(201)
  create(@Param('id') productId: string) {
    return this.checkpoints.signHead(productId);
  }

  /** Whether the signature is ours and the current chain still contains that link with that hash. */
  @Post('checkpoints/verify')
  @HttpCode(200)
  verify(@Body() body: unknown) {
    return this.checkpoints.verify(body);
  }

  /** The public key that checks checkpoint signatures (SPKI PEM), and every earlier one with its validity, for auditors who verify offline. */
  @Get('checkpoints/public-key')
  @Public()
  async publicKey() {
    const key = this.checkpoints.key;
    return {
      algorithm: CHECKPOINT_ALGORITHM,
      keyId: key.keyId,
      publicKey: key.publicKeyPem,
      history: await this.checkpoints.history(),
      signedText: 'RFC 8785 canonical JSON of {"type":"leadline-checkpoint","productId","seq","headHash","time"}; the signature is base64',
    };
  }
}
